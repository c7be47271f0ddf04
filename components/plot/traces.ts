// Plot traces, typed against plotly's own types (no casts): points by index, markers, lines, a band, axes.
// What is drawn is decimated (lib/plot/decimate.ts), so a trace holds a few thousand points at most; SVG draws that
// many faster than WebGL does without a GPU (bench page), so WebGL is kept for larger traces only.
import type { Data, Layout, Shape } from "plotly.js";

/** Above this many points a trace is drawn with WebGL. */
export const SVG_POINT_LIMIT = 5000;

export const traceType = (n: number): "scatter" | "scattergl" => (n > SVG_POINT_LIMIT ? "scattergl" : "scatter");

export interface Series {
  t: ArrayLike<number>;
  y: ArrayLike<number>;
}

/** Points picked by index, with the index as customdata (what a click or a box selection gives back). */
export function pointTrace(name: string, idx: readonly number[], s: Series, scale: { t: number; y: (v: number) => number }, marker: { color: string; size: number; symbol?: "x" | "circle-open" }): Data {
  return {
    type: traceType(idx.length),
    mode: "markers",
    name,
    x: idx.map((i) => s.t[i]! / scale.t),
    y: idx.map((i) => scale.y(s.y[i]!)),
    customdata: [...idx],
    marker,
  };
}

export function markerTrace(name: string, x: readonly number[], y: readonly number[], tScale: number, marker: { color: string; size: number }): Data {
  return { type: traceType(x.length), mode: "markers", name, x: x.map((v) => v / tScale), y: [...y], marker };
}

export function lineTrace(name: string, x: readonly number[], y: readonly number[], tScale: number, line: { color: string; width?: number; dash?: "dash" }): Data {
  return { type: traceType(x.length), mode: "lines", name, x: x.map((v) => v / tScale), y: [...y], line };
}

/** The fitting window as a band behind the points. */
export function windowBand(from: number | null, to: number | null, t: ArrayLike<number>, tScale: number): Partial<Shape>[] {
  if (from === null && to === null) return [];
  return [{ type: "rect", xref: "x", yref: "paper", x0: (from ?? t[0]!) / tScale, x1: (to ?? t[t.length - 1]!) / tScale, y0: 0, y1: 1, fillcolor: "#d7eef0", opacity: 0.35, line: { width: 0 }, layer: "below" }];
}

export function axes(x: string, y: string, extra: Partial<Layout> = {}): Partial<Layout> {
  return { xaxis: { title: { text: x } }, yaxis: { title: { text: y } }, ...extra };
}

/** A 95 % band: an invisible upper edge and the lower edge filled up to it (two traces, one legend entry). */
export function bandTraces(name: string, x: readonly number[], low: readonly number[], high: readonly number[], fillcolor: string): Data[] {
  return [
    { type: "scatter", mode: "lines", name, x: [...x], y: [...high], line: { width: 0 }, showlegend: false, hoverinfo: "skip" },
    { type: "scatter", mode: "lines", name, x: [...x], y: [...low], fill: "tonexty", fillcolor, line: { width: 0 } },
  ];
}

/** Markers with symmetric error bars (±1 SE, say). */
export function errorMarkerTrace(name: string, x: readonly number[], y: readonly number[], err: readonly number[], marker: { color: string; size: number }): Data {
  return { type: "scatter", mode: "markers", name, x: [...x], y: [...y], error_y: { type: "data", array: [...err], visible: true }, marker };
}
