// The plot a reviewer signs: the data (fitted points as dots, points outside the fit as open rings), the fitted curve,
// and the residuals below, with axes, ticks and units. One scene, drawn two ways: as SVG on the record and share pages
// (server-rendered, no script needed) and as vector paths in the PDF. Points are thinned by the app's one decimator
// (lib/plot/decimate.ts: the first, lowest and highest reading per pixel column), so a million-point run draws as fast
// as a small one and no spike disappears.
import { MODELS } from "@/lib/kinetics/models";
import { decimateIndices } from "@/lib/plot/decimate";
import { convertReading } from "@/lib/kinetics/workspace";
import type { FitOptions } from "@/lib/schemas/fits";
import type { StoredResults } from "@/lib/fits";

export interface Tick {
  at: number;
  label: string;
}

export interface Panel {
  /** Box in scene units (the SVG's user space; PDF points after scaling). */
  x: number;
  y: number;
  w: number;
  h: number;
  xTicks: Tick[];
  yTicks: Tick[];
  xLabel: string | null;
  yLabel: string;
  /** Data points already in scene coordinates. */
  points: Array<{ x: number; y: number; outside: boolean }>;
  /** Polyline in scene coordinates. */
  line: Array<[number, number]>;
  /** A horizontal reference line (zero for residuals), in scene coordinates. */
  rule: number | null;
  /** Vertical error bars (x, low y, high y), in scene coordinates. */
  bars?: Array<[number, number, number]>;
  /** A shaded band (x, upper y, lower y) along the line, in scene coordinates. */
  band?: Array<[number, number, number]>;
}

export interface PlotScene {
  width: number;
  height: number;
  panels: Panel[];
  /** What is drawn, for the legend and for screen readers. */
  legend: { points: string; outside: string | null; line: string | null };
  description: string;
}

/**
 * The nice step (1, 2, 5 × 10ⁿ) for about `count` intervals over [lo, hi] (widened when lo = hi): the common
 * axis-labelling rule (Heckbert, Graphics Gems). A step a rounding error above 1, 2 or 5 × 10ⁿ still takes that step
 * (0.5 / 5 may come out as 0.10000000000000002).
 */
function niceStep(lo: number, hi: number, count: number): { lo: number; hi: number; step: number } {
  if (hi === lo) {
    const d = Math.abs(lo) * 0.05 || 1;
    lo -= d;
    hi += d;
  }
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  return { lo, hi, step: [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw * (1 - 1e-9))! };
}

function tickLabel(v: number, step: number): string {
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  if (Math.abs(v) >= 1e5 || (Math.abs(v) < 1e-3 && v !== 0)) return v.toExponential(1).replace("e", "×10^").replace("+", "");
  return v.toFixed(Math.min(decimals, 6)).replace("-", "−");
}

export function ticks(lo: number, hi: number, count: number): { values: number[]; ticks: (map: (v: number) => number) => Tick[]; lo: number; hi: number } {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return { values: [], lo: 0, hi: 1, ticks: () => [] };
  // The axis runs from the tick at or below lo to the tick at or above hi, so no point sits on the frame and every
  // tick between is labelled.
  const n = niceStep(lo, hi, count);
  const step = n.step;
  lo = n.lo;
  hi = n.hi;
  const first = Math.floor(lo / step + 1e-9),
    last = Math.ceil(hi / step - 1e-9);
  const values: number[] = [];
  for (let i = first; i <= last; i++) values.push(Math.abs(i * step) < step * 1e-9 ? 0 : i * step);
  return { values, lo: first * step, hi: last * step, ticks: (map) => values.map((v) => ({ at: map(v), label: tickLabel(v, step) })) };
}

/** The y axis's words: the quantity and its unit. */
export function plotAxisLabel(quantity: string, unit: string): string {
  return `${quantity === "concentration" ? "concentration" : "absorbance"} (${unit})`;
}

export interface FitPlotInput {
  t: ArrayLike<number>;
  /** Readings as stored (before any conversion). */
  y: ArrayLike<number>;
  options: Pick<FitOptions, "conversion" | "window" | "exclusions">;
  results: Pick<StoredResults, "models">;
  /** Which model's curve to draw (the record's primary model, or the nearest nonlinear one). */
  model: string;
  yUnit: string;
}

/** The scene of a fit record: data and curve above, residuals of the fitted points below. */
export function fitPlotScene(input: FitPlotInput, size = { width: 720, height: 420 }): PlotScene {
  const n = input.t.length;
  const conv = input.options.conversion ?? null;
  const t = Float64Array.from(input.t);
  const y = Float64Array.from(input.y, (v) => (conv ? convertReading(v, conv) : v));
  const excluded = new Set((input.options.exclusions ?? []).map((e) => e.index));
  const from = input.options.window?.from ?? -Infinity,
    to = input.options.window?.to ?? Infinity;
  const included = Array.from({ length: n }, (_, i) => !excluded.has(i) && t[i]! >= from && t[i]! <= to && Number.isFinite(y[i]!));

  // The curve: the record's model where it draws one, else the first converged nonlinear model of the record.
  const candidates = [input.model, ...input.results.models.map((m) => m.model)];
  let curveModel: string | null = null;
  let curve: Float64Array | null = null;
  let curveAt: ((t: Float64Array) => Float64Array) | null = null;
  for (const id of candidates) {
    const d = MODELS.find((m) => m.id === id);
    const r = input.results.models.find((m) => m.model === id)?.result;
    if (!d?.curve || !r?.converged) continue;
    const values = Object.fromEntries(r.parameters.map((p) => [p.name, p.value ?? NaN]));
    if (!Object.values(values).every(Number.isFinite)) continue;
    const draw = d.curve;
    curveAt = (at) => draw(at, values);
    curve = curveAt(t);
    curveModel = d.label;
    break;
  }

  const minutes = n > 0 && t[n - 1]! - t[0]! > 2400;
  const tScale = minutes ? 1 / 60 : 1;
  const tUnit = minutes ? "min" : "s";
  const margin = { left: 78, right: 16, top: 12, bottom: 44 };
  const gap = 34;
  const plotW = size.width - margin.left - margin.right;
  const mainH = Math.round((size.height - margin.top - margin.bottom - gap) * 0.68);
  const resH = size.height - margin.top - margin.bottom - gap - mainH;

  let tMin = Infinity,
    tMax = -Infinity,
    yMin = Infinity,
    yMax = -Infinity;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y[i]!)) continue;
    tMin = Math.min(tMin, t[i]! * tScale);
    tMax = Math.max(tMax, t[i]! * tScale);
    yMin = Math.min(yMin, y[i]!);
    yMax = Math.max(yMax, y[i]!);
  }
  if (!Number.isFinite(tMin)) {
    tMin = 0;
    tMax = 1;
    yMin = 0;
    yMax = 1;
  }
  const tx = ticks(tMin, tMax, 6);
  const ty = ticks(yMin, yMax, 5);
  const X = (v: number) => margin.left + ((v - tx.lo) / (tx.hi - tx.lo || 1)) * plotW;
  const mainTop = margin.top;
  const Y = (v: number) => mainTop + mainH - ((v - ty.lo) / (ty.hi - ty.lo || 1)) * mainH;

  const tShown = Float64Array.from(t, (v) => v * tScale);
  const idx = decimateIndices(tShown, y, Math.round(plotW), (i) => included[i]!);
  const mainPanel: Panel = {
    x: margin.left,
    y: mainTop,
    w: plotW,
    h: mainH,
    xTicks: tx.ticks(X),
    yTicks: ty.ticks(Y),
    xLabel: null,
    yLabel: input.yUnit,
    points: idx.filter((i) => Number.isFinite(y[i]!)).map((i) => ({ x: X(tShown[i]!), y: Y(y[i]!), outside: !included[i] })),
    line: [],
    rule: null,
  };
  if (curve && curveAt) {
    // The curve at one point per pixel column over the fitted span.
    let a = Infinity,
      b = -Infinity;
    for (let i = 0; i < n; i++)
      if (included[i]) {
        a = Math.min(a, t[i]!);
        b = Math.max(b, t[i]!);
      }
    const grid = Float64Array.from({ length: Math.round(plotW) + 1 }, (_, i) => a + ((b - a) * i) / Math.round(plotW));
    const c = curveAt(grid);
    for (let i = 0; i < grid.length; i++) if (Number.isFinite(c[i]!) && c[i]! >= ty.lo - (ty.hi - ty.lo) && c[i]! <= ty.hi + (ty.hi - ty.lo)) mainPanel.line.push([X(grid[i]! * tScale), Y(c[i]!)]);
  }

  // Residuals of the fitted points (data − curve).
  const res = new Float64Array(n);
  let rMax = 0;
  for (let i = 0; i < n; i++) {
    res[i] = curve && included[i] ? y[i]! - curve[i]! : NaN;
    if (Number.isFinite(res[i]!)) rMax = Math.max(rMax, Math.abs(res[i]!));
  }
  const tr = ticks(-(rMax || 1), rMax || 1, 4);
  const resTop = mainTop + mainH + gap;
  const YR = (v: number) => resTop + resH - ((v - tr.lo) / (tr.hi - tr.lo || 1)) * resH;
  const ridx = curve ? decimateIndices(tShown, res, Math.round(plotW)) : [];
  const resPanel: Panel = {
    x: margin.left,
    y: resTop,
    w: plotW,
    h: resH,
    xTicks: tx.ticks(X),
    yTicks: tr.ticks(YR),
    xLabel: `t (${tUnit})`,
    yLabel: "residual",
    points: ridx.filter((i) => Number.isFinite(res[i]!)).map((i) => ({ x: X(tShown[i]!), y: YR(res[i]!), outside: false })),
    line: [],
    rule: YR(0),
  };
  const outsideCount = included.filter((v) => !v).length;
  return {
    width: size.width,
    height: size.height,
    panels: [mainPanel, resPanel],
    legend: { points: `${n - outsideCount} fitted points`, outside: outsideCount ? `${outsideCount} outside the fit` : null, line: curveModel ? `${curveModel} fit` : null },
    description: `Readings (${input.yUnit}) against time (${tUnit}), ${n} points${outsideCount ? `, ${outsideCount} outside the fit` : ""}${curveModel ? `, with the ${curveModel} curve and its residuals below` : ", no fitted curve"}.`,
  };
}

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);
const f = (v: number) => (Math.round(v * 10) / 10).toString();

/** The scene as an SVG document (scales to its container; text in the page's own font). */
export function sceneToSvg(scene: PlotScene, title: string): string {
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${scene.width} ${scene.height}" width="100%" role="img" aria-labelledby="plot-title plot-desc" font-family="inherit" font-size="12">`);
  parts.push(`<title id="plot-title">${esc(title)}</title><desc id="plot-desc">${esc(scene.description)}</desc>`);
  for (const p of scene.panels) {
    parts.push(`<rect x="${f(p.x)}" y="${f(p.y)}" width="${f(p.w)}" height="${f(p.h)}" fill="none" stroke="#a9b1bf" stroke-width="0.8"/>`);
    for (const t of p.yTicks) parts.push(`<line x1="${f(p.x - 4)}" x2="${f(p.x + p.w)}" y1="${f(t.at)}" y2="${f(t.at)}" stroke="#e3e7ee" stroke-width="0.6"/><text x="${f(p.x - 7)}" y="${f(t.at + 4)}" text-anchor="end" fill="#3a4456">${esc(t.label)}</text>`);
    for (const t of p.xTicks) parts.push(`<line x1="${f(t.at)}" x2="${f(t.at)}" y1="${f(p.y + p.h)}" y2="${f(p.y + p.h + 4)}" stroke="#5d687c" stroke-width="0.8"/>${p.xLabel ? `<text x="${f(t.at)}" y="${f(p.y + p.h + 17)}" text-anchor="middle" fill="#3a4456">${esc(t.label)}</text>` : ""}`);
    parts.push(`<text transform="translate(${f(p.x - 62)} ${f(p.y + p.h / 2)}) rotate(-90)" text-anchor="middle" fill="#1b2230">${esc(p.yLabel)}</text>`);
    if (p.xLabel) parts.push(`<text x="${f(p.x + p.w / 2)}" y="${f(p.y + p.h + 36)}" text-anchor="middle" fill="#1b2230">${esc(p.xLabel)}</text>`);
    if (p.rule !== null) parts.push(`<line x1="${f(p.x)}" x2="${f(p.x + p.w)}" y1="${f(p.rule)}" y2="${f(p.rule)}" stroke="#5d687c" stroke-width="0.8" stroke-dasharray="4 3"/>`);
    if (p.band && p.band.length > 1) parts.push(`<polygon points="${[...p.band.map(([x, hi]) => `${f(x)},${f(hi)}`), ...[...p.band].reverse().map(([x, , lo]) => `${f(x)},${f(lo)}`)].join(" ")}" fill="#1a8a94" fill-opacity="0.18" stroke="none"/>`);
    for (const [x, lo, hi] of p.bars ?? []) parts.push(`<path d="M${f(x)} ${f(lo)}V${f(hi)}M${f(x - 4)} ${f(lo)}h8M${f(x - 4)} ${f(hi)}h8" stroke="#2b50c8" stroke-width="1.2" fill="none"/>`);
    if (p.line.length > 1) parts.push(`<polyline points="${p.line.map(([x, y]) => `${f(x)},${f(y)}`).join(" ")}" fill="none" stroke="#d55e00" stroke-width="1.8"/>`);
    const many = p.points.length > 400;
    const dots = p.points.filter((q) => !q.outside).map((q) => `M${f(q.x)} ${f(q.y)}h0`).join("");
    if (dots) parts.push(`<path d="${dots}" stroke="#2b50c8" stroke-width="${many ? 3 : 6}" stroke-linecap="round" fill="none"/>`);
    for (const q of p.points.filter((r) => r.outside)) parts.push(`<circle cx="${f(q.x)}" cy="${f(q.y)}" r="3.5" fill="#ffffff" stroke="#5d687c" stroke-width="1.3"/>`);
  }
  parts.push("</svg>");
  return parts.join("");
}

/** Minimal drawing surface of pdfkit's document, for drawing a scene as vector paths. */
export interface PdfSurface {
  save(): PdfSurface;
  restore(): PdfSurface;
  lineWidth(w: number): PdfSurface;
  strokeColor(c: string): PdfSurface;
  fillColor(c: string): PdfSurface;
  rect(x: number, y: number, w: number, h: number): PdfSurface;
  moveTo(x: number, y: number): PdfSurface;
  lineTo(x: number, y: number): PdfSurface;
  circle(x: number, y: number, r: number): PdfSurface;
  stroke(): PdfSurface;
  fill(): PdfSurface;
  dash(len: number, opts?: { space: number }): PdfSurface;
  undash(): PdfSurface;
  fontSize(s: number): PdfSurface;
  text(s: string, x: number, y: number, opts?: { width?: number; align?: string; lineBreak?: boolean }): PdfSurface;
  rotate(angle: number, opts: { origin: [number, number] }): PdfSurface;
}

/** Draws the scene at (x0, y0), scaled to `width` points wide; returns the height used. */
export function drawSceneOnPdf(doc: PdfSurface, scene: PlotScene, x0: number, y0: number, width: number, printable: (s: string) => string): number {
  const s = width / scene.width;
  const X = (v: number) => x0 + v * s,
    Y = (v: number) => y0 + v * s;
  doc.save();
  for (const p of scene.panels) {
    doc.lineWidth(0.3).strokeColor("#e3e7ee");
    for (const t of p.yTicks) doc.moveTo(X(p.x), Y(t.at)).lineTo(X(p.x + p.w), Y(t.at)).stroke();
    doc.lineWidth(0.6).strokeColor("#a9b1bf").rect(X(p.x), Y(p.y), p.w * s, p.h * s).stroke();
    doc.fillColor("#3a4456").fontSize(7);
    for (const t of p.yTicks) doc.text(printable(t.label), X(p.x) - 52, Y(t.at) - 3, { width: 46, align: "right", lineBreak: false });
    for (const t of p.xTicks) {
      doc.lineWidth(0.6).strokeColor("#5d687c").moveTo(X(t.at), Y(p.y + p.h)).lineTo(X(t.at), Y(p.y + p.h) + 3).stroke();
      if (p.xLabel) doc.text(printable(t.label), X(t.at) - 25, Y(p.y + p.h) + 5, { width: 50, align: "center", lineBreak: false });
    }
    doc.fillColor("#1b2230").fontSize(8);
    if (p.xLabel) doc.text(printable(p.xLabel), X(p.x + p.w / 2) - 60, Y(p.y + p.h) + 16, { width: 120, align: "center", lineBreak: false });
    doc.save().rotate(-90, { origin: [X(p.x) - 50, Y(p.y + p.h / 2)] });
    doc.text(printable(p.yLabel), X(p.x) - 50 - 60, Y(p.y + p.h / 2) - 12, { width: 120, align: "center", lineBreak: false });
    doc.restore();
    if (p.rule !== null) doc.lineWidth(0.5).strokeColor("#5d687c").dash(3, { space: 2 }).moveTo(X(p.x), Y(p.rule)).lineTo(X(p.x + p.w), Y(p.rule)).stroke().undash();
    if (p.band && p.band.length > 1) {
      doc.save().fillColor("#c9e6e8").moveTo(X(p.band[0]![0]), Y(p.band[0]![1]));
      for (const [x, hi] of p.band.slice(1)) doc.lineTo(X(x), Y(hi));
      for (const [x, , lo] of [...p.band].reverse()) doc.lineTo(X(x), Y(lo));
      doc.fill().restore();
    }
    for (const [x, lo, hi] of p.bars ?? []) {
      doc.lineWidth(0.7).strokeColor("#2b50c8").moveTo(X(x), Y(lo)).lineTo(X(x), Y(hi)).stroke();
      doc.moveTo(X(x) - 2.5, Y(lo)).lineTo(X(x) + 2.5, Y(lo)).stroke().moveTo(X(x) - 2.5, Y(hi)).lineTo(X(x) + 2.5, Y(hi)).stroke();
    }
    if (p.line.length > 1) {
      doc.lineWidth(1.1).strokeColor("#d55e00").moveTo(X(p.line[0]![0]), Y(p.line[0]![1]));
      for (const [x, y] of p.line.slice(1)) doc.lineTo(X(x), Y(y));
      doc.stroke();
    }
    const r = p.points.length > 400 ? 0.9 : 1.8;
    for (const q of p.points) {
      if (q.outside) doc.lineWidth(0.6).strokeColor("#5d687c").circle(X(q.x), Y(q.y), r + 0.6).stroke();
      else doc.fillColor("#2b50c8").circle(X(q.x), Y(q.y), r).fill();
    }
  }
  doc.restore();
  return scene.height * s;
}
