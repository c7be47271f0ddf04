// Units the parsers and the engine share: time units to seconds, quantities, and the recognised metadata numbers.

export const TIME_UNIT_SECONDS: Record<string, number> = {
  ms: 0.001,
  s: 1,
  sec: 1,
  secs: 1,
  second: 1,
  seconds: 1,
  min: 60,
  mins: 60,
  minute: 60,
  minutes: 60,
  h: 3600,
  hr: 3600,
  hrs: 3600,
  hour: 3600,
  hours: 3600,
  d: 86400,
  day: 86400,
  days: 86400,
};

/** Seconds per unit for a written time unit ("min", "s", "Minutes"), or null when it is not one. */
export function timeUnitFactor(unit: string): number | null {
  return TIME_UNIT_SECONDS[unit.trim().toLowerCase().replace(/\.$/, "")] ?? null;
}

export type Quantity = "absorbance" | "transmittance-converted absorbance" | "concentration" | "signal";

/** A = 2 − log10(%T). */
export function percentTToAbsorbance(percentT: number): number {
  return 2 - Math.log10(percentT);
}

/** Path length in cm from a value and its written unit (cm default, mm). */
export function toCentimetres(value: number, unit: string | undefined): number {
  const u = (unit ?? "cm").trim().toLowerCase();
  if (u === "mm") return value / 10;
  if (u === "m") return value * 100;
  if (u === "µm" || u === "um") return value / 10_000;
  return value;
}

/** Temperature in °C from a value and its written unit (°C default, K, °F). */
export function toCelsius(value: number, unit: string | undefined): number {
  const u = (unit ?? "").trim().toLowerCase().replace("°", "").replace("º", "");
  if (u === "k" || u === "kelvin") return value - 273.15;
  if (u === "f") return ((value - 32) * 5) / 9;
  return value;
}
