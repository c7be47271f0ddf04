// Result types shared by every fit the engine makes.

export interface ParameterEstimate {
  name: string;
  /** Null when the fit failed (start values are never handed back as an answer), or for a value at t = 0 that is out
   * of range (the result's warnings say why). */
  value: number | null;
  se: number | null;
  ci95: [number, number] | null;
  fixed: boolean;
  /** SE with a calibration slope's uncertainty added (rate constants fitted on calibrated concentrations). */
  se_with_calibration?: number;
  /** Held at a value another model fitted (the linearized fit's A∞ from the nonlinear first-order fit). */
  held_from?: string;
}

export type Weighting =
  | { kind: "none" }
  /** Weights known up to a factor: covariance scaled by s². */
  | { kind: "relative"; weights: ArrayLike<number> }
  /** Known standard deviations: covariance (JᵀWJ)⁻¹, not scaled. */
  | { kind: "absolute"; sigma: ArrayLike<number> };

export interface FitResult {
  model: string;
  /** The user formula as read, for model "formula". */
  formula?: string;
  n: number;
  parameters: ParameterEstimate[];
  ssr: number | null;
  dof: number;
  r2: number | null;
  rmse: number | null;
  aicc: number | null;
  runs: number | null;
  runs_z: number | null;
  runs_p: number | null;
  durbin_watson: number | null;
  converged: boolean;
  iterations: number;
  message: string;
  /** Correlation matrix of the free parameters (names in `correlation_names`). */
  correlation: number[][] | null;
  correlation_names: string[];
  warnings: string[];
  weighting: Weighting["kind"];
  /** y − fitted, in data units, one per point (typed, so a million points cost 8 MB, not a JS array). */
  residuals: Float64Array;
  fitted: Float64Array;
  /** Straight-line methods: the line's abscissa per point of `fitted` (time for linearized and Guggenheim fits). */
  line_x?: Float64Array;
}

export interface ModelFunction {
  params: readonly string[];
  evaluate(t: Float64Array, p: ArrayLike<number>, out: Float64Array): void;
  jacobian(t: Float64Array, p: ArrayLike<number>, J: Float64Array): void;
}
