// A channel's colour from its wavelength: the colour a solution shows is the complement of what it absorbs, so a 590 nm
// run is drawn in the violet-blue the analyst saw in the cuvette. Bands from the usual textbook table of absorbed vs
// observed colour (common practice); UV, IR and unknown wavelengths get a neutral ink.

const BANDS: ReadonlyArray<{ from: number; to: number; seen: string; hex: string }> = [
  { from: 400, to: 435, seen: "yellow-green", hex: "#7d8f12" },
  { from: 435, to: 480, seen: "yellow", hex: "#a68a00" },
  { from: 480, to: 490, seen: "orange", hex: "#c0610a" },
  { from: 490, to: 500, seen: "red", hex: "#b3261e" },
  { from: 500, to: 560, seen: "purple", hex: "#7b2d8e" },
  { from: 560, to: 580, seen: "violet", hex: "#5b3cc4" },
  { from: 580, to: 595, seen: "blue", hex: "#2b50c8" },
  { from: 595, to: 605, seen: "green-blue", hex: "#0e7c86" },
  { from: 605, to: 750, seen: "blue-green", hex: "#13806a" },
];

export const NEUTRAL_CHANNEL = "#3a4457";

export function solutionColour(wavelengthNm: number | null | undefined): { hex: string; seen: string | null } {
  if (wavelengthNm == null || !Number.isFinite(wavelengthNm)) return { hex: NEUTRAL_CHANNEL, seen: null };
  const b = BANDS.find((x) => wavelengthNm >= x.from && wavelengthNm < x.to);
  return b ? { hex: b.hex, seen: b.seen } : { hex: NEUTRAL_CHANNEL, seen: null };
}

/** Distinct, colour-blind-safe fallbacks for several channels at one wavelength (Okabe–Ito order). */
export const CHANNEL_PALETTE = ["#0072b2", "#d55e00", "#009e73", "#cc79a7", "#e69f00", "#56b4e9", "#000000"];
