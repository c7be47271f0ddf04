// Guggenheim's method: k from ln|y(t) − y(t + Δ)| on t over pairs of readings Δ apart; A∞ not needed.
import { guggenheim as fitGuggenheim } from "../linearized";
import type { ModelDescriptor } from "./types";

export const guggenheim: ModelDescriptor = {
  id: "guggenheim",
  label: "Guggenheim",
  family: "straight-line",
  equation: "ln|y(t) − y(t + Δ)| = const − k·t",
  params: [
    { name: "k", label: "rate constant", dimension: "1/t" },
    { name: "amplitude", label: "amplitude a0 − A∞", dimension: "y" },
  ],
  comparable: false,
  kScalesWithConcentration: false,
  firstOrderK: true,
  needsInterval: true,
  curve: null,
  fit: (t, y, spec) => fitGuggenheim(t, y, spec.interval ?? NaN, spec.snapInterval ?? false),
};
