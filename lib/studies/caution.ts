// The caution printed beside every prediction from a study (pages, PDF, CSV).
export const PREDICTION_CAUTION =
  "Predictions are estimates for qualified review, not release or shelf-life decisions; local regulations and the lab's SOPs govern shelf-life claims.";
