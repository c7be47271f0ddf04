// The temperature plots a reviewer signs on a study: ln k (Arrhenius) or ln(k/T) (Eyring) against 1000/T, each rate
// constant with its ±1 SE bar (SE of ln k = SE(k)/k), the fitted line and its 95 % confidence band. The same scene model
// as the fit plot (lib/reports/fit-plot.ts), so it draws as SVG on the page and as vectors in the PDF.
import { arrheniusBand, celsiusToKelvin, eyringBand, type RatePoint } from "@/lib/kinetics/temperature";
import { ticks, type Panel, type PlotScene } from "./fit-plot";

export interface RateMember {
  temperature_used_c: number | null;
  k: number;
  se: number | null;
}

/** Arrhenius or Eyring scene of a temperature study's members (band over the measured range ±5 K). */
export function ratePlotScene(kind: "arrhenius" | "eyring", members: readonly RateMember[], weighted: boolean, size = { width: 520, height: 320 }): PlotScene {
  const pts = members
    .filter((m) => m.temperature_used_c !== null && m.k > 0)
    .map((m) => {
      const T = celsiusToKelvin(m.temperature_used_c!);
      const y = kind === "arrhenius" ? Math.log(m.k) : Math.log(m.k / T);
      const e = m.se !== null && m.se > 0 ? m.se / m.k : null;
      return { T, x: 1000 / T, y, lo: e === null ? null : y - e, hi: e === null ? null : y + e };
    });
  const points: RatePoint[] = members.filter((m) => m.temperature_used_c !== null && m.k > 0).map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c!), k: m.k, se: weighted ? m.se : null }));
  let band: Array<{ x: number; mid: number; low: number; high: number }> = [];
  const distinct = new Set(pts.map((p) => p.T.toFixed(2))).size;
  if (distinct >= 2 && pts.length >= 3) {
    const lo = Math.min(...pts.map((p) => p.T)) - 5,
      hi = Math.max(...pts.map((p) => p.T)) + 5;
    const grid = Array.from({ length: 41 }, (_, i) => lo + ((hi - lo) * i) / 40);
    band =
      kind === "arrhenius"
        ? arrheniusBand(points, grid).map((b) => ({ x: 1000 / b.temperatureK, mid: b.lnK, low: b.low, high: b.high }))
        : eyringBand(points, grid).map((b) => ({ x: 1000 / b.temperatureK, mid: b.lnKOverT, low: b.low, high: b.high }));
  }
  const xs = [...pts.map((p) => p.x), ...band.map((b) => b.x)];
  const ys = [...pts.flatMap((p) => [p.y, p.lo ?? p.y, p.hi ?? p.y]), ...band.flatMap((b) => [b.low, b.high])];
  const margin = { left: 78, right: 16, top: 12, bottom: 44 };
  const w = size.width - margin.left - margin.right,
    h = size.height - margin.top - margin.bottom;
  const tx = ticks(Math.min(...xs), Math.max(...xs), 5);
  const ty = ticks(Math.min(...ys), Math.max(...ys), 5);
  const X = (v: number) => margin.left + ((v - tx.lo) / (tx.hi - tx.lo || 1)) * w;
  const Y = (v: number) => margin.top + h - ((v - ty.lo) / (ty.hi - ty.lo || 1)) * h;
  const yLabel = kind === "arrhenius" ? "ln (k / s⁻¹)" : "ln (k / T)";
  const panel: Panel = {
    x: margin.left,
    y: margin.top,
    w,
    h,
    xTicks: tx.ticks(X),
    yTicks: ty.ticks(Y),
    xLabel: "1000 / T (K⁻¹)",
    yLabel,
    points: pts.map((p) => ({ x: X(p.x), y: Y(p.y), outside: false })),
    line: band.map((b) => [X(b.x), Y(b.mid)] as [number, number]),
    rule: null,
    bars: pts.filter((p) => p.lo !== null).map((p) => [X(p.x), Y(p.lo!), Y(p.hi!)] as [number, number, number]),
    band: band.map((b) => [X(b.x), Y(b.high), Y(b.low)] as [number, number, number]),
  };
  const name = kind === "arrhenius" ? "Arrhenius" : "Eyring";
  return {
    width: size.width,
    height: size.height,
    panels: [panel],
    legend: { points: `${pts.length} rate constants (bars ±1 SE)`, outside: null, line: band.length ? `${weighted ? "weighted " : ""}${name} line with its 95 % confidence band` : null },
    description: `${name} plot: ${yLabel} against 1000/T for ${pts.length} rate constants at ${distinct} temperatures${band.length ? `, with the ${weighted ? "weighted " : ""}fitted line and its 95 % confidence band` : ""}.`,
  };
}

/**
 * One residual panel per run of a global fit (reading − curve under the shared law, against time), stacked, on one
 * residual scale so their sizes compare; a run that does not follow the shared law shows as a pattern or a wider band.
 */
export function residualPanelsScene(runs: ReadonlyArray<{ label: string; t: readonly number[]; r: readonly number[] }>, width = 720): PlotScene {
  const margin = { left: 78, right: 16, top: 12, bottom: 46 };
  const panelH = 70,
    gap = 56;
  const rMax = Math.max(1e-12, ...runs.flatMap((x) => x.r.map(Math.abs)));
  const panels: Panel[] = [];
  const w = width - margin.left - margin.right;
  runs.forEach((run, i) => {
    const top = margin.top + i * (panelH + gap);
    const minutes = run.t.length > 0 && run.t.at(-1)! - run.t[0]! > 2400;
    const f = minutes ? 1 / 60 : 1;
    const tx = ticks(Math.min(...run.t) * f, Math.max(...run.t) * f, 6);
    const ty = ticks(-rMax, rMax, 2);
    const X = (v: number) => margin.left + ((v - tx.lo) / (tx.hi - tx.lo || 1)) * w;
    const Y = (v: number) => top + panelH - ((v - ty.lo) / (ty.hi - ty.lo || 1)) * panelH;
    panels.push({
      x: margin.left,
      y: top,
      w,
      h: panelH,
      xTicks: tx.ticks(X),
      yTicks: ty.ticks(Y),
      xLabel: `${run.label}: t (${minutes ? "min" : "s"})`,
      yLabel: "residual",
      points: run.t.map((t, q) => ({ x: X(t * f), y: Y(run.r[q]!), outside: false })),
      line: [],
      rule: Y(0),
    });
  });
  return {
    width,
    height: margin.top + runs.length * (panelH + gap) - gap + margin.bottom,
    panels,
    legend: { points: "residuals (reading − curve under the shared law)", outside: null, line: null },
    description: `Residuals of each run under the shared law, one panel per run (${runs.map((r) => r.label).join(", ")}), on one scale.`,
  };
}
