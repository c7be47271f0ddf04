// Kezdy–Swinbourne: y(t + Δ) on y(t); k = −ln(slope)/Δ and A∞ = intercept/(1 − slope).
import { kezdySwinbourne as fitKs } from "../linearized";
import type { ModelDescriptor } from "./types";

export const kezdySwinbourne: ModelDescriptor = {
  id: "kezdy-swinbourne",
  label: "Kezdy–Swinbourne",
  family: "straight-line",
  equation: "y(t + Δ) = A∞·(1 − e^(−kΔ)) + e^(−kΔ)·y(t)",
  params: [
    { name: "k", label: "rate constant", dimension: "1/t" },
    { name: "ainf", label: "end value A∞", dimension: "y" },
  ],
  comparable: false,
  kScalesWithConcentration: false,
  firstOrderK: true,
  needsInterval: true,
  curve: null,
  fit: (t, y, spec) => fitKs(t, y, spec.interval ?? NaN, spec.snapInterval ?? false),
};
