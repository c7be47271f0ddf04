// What the fitting page draws from a fit (components/fits/fit-display.ts), computed in the Web Worker: every kind of
// point kept apart, excluded points all drawn, curves decimated by the one decimator, and nothing of full length left
// in what crosses to the page. Invented trace (a smooth decay; only the bookkeeping is checked).
import { describe, expect, it } from "vitest";
import { fitDisplay, PLOT_COLUMNS, pointsDisplay } from "@/components/fits/fit-display";
import { fitSeriesWithOptions } from "@/lib/kinetics/workspace";
import { decimate } from "@/lib/plot/decimate";

describe("fitDisplay", () => {
  const n = 50_000;
  const t = Float64Array.from({ length: n }, (_, i) => i * 0.2);
  const y = Float64Array.from({ length: n }, (_, i) => 0.05 + 0.9 * Math.exp(-t[i]! / 2000) + 1e-3 * Math.sin(i));
  const options = { models: ["linearized", "first-order"], window: { from: 100, to: null }, exclusions: [{ index: 9_000, reason: "bubble" }, { index: 9_001, reason: "bubble" }] };
  const full = fitSeriesWithOptions(t, y, options);
  const { outcome, display } = fitDisplay(full, t, y, new Set([9_000, 9_001]));

  it("keeps each kind of point apart, every excluded one drawn, the rest decimated", () => {
    expect(display.shown.ex).toEqual([9_000, 9_001]);
    expect(display.shown.total).toBe(n);
    expect(display.shown.out.every((i) => t[i]! < 100)).toBe(true);
    expect(display.shown.inc.every((i) => full.included[i])).toBe(true);
    expect(display.shown.inc.length).toBeLessThanOrEqual(3 * PLOT_COLUMNS);
    // The first and the last included points are drawn (the decimator keeps each column's first, lowest and highest).
    expect(display.shown.inc[0]).toBe(full.included.indexOf(true));
  });

  it("curves and residuals are the decimator's own, and nothing of full length crosses to the page", () => {
    const c = full.curves["first-order"]!;
    expect(display.curves["first-order"]!.fitted).toEqual(decimate(c.t, c.fitted, PLOT_COLUMNS));
    expect(display.curves["first-order"]!.residuals).toEqual(decimate(c.t, c.residuals, PLOT_COLUMNS / 2));
    expect(display.linear).toEqual(decimate(full.linearized_view!.t, full.linearized_view!.ln, PLOT_COLUMNS / 2));
    expect(outcome).not.toHaveProperty("curves");
    expect(outcome.linearized_view).toEqual({ line: full.linearized_view!.line });
    expect(outcome.models).toBe(full.models);
  });

  it("before the first fit lands, the points are drawn as that fit will take them, without curves", () => {
    const before = pointsDisplay(t, y, new Set([9_000, 9_001]), options.window);
    expect(before.shown).toEqual(display.shown);
    expect([before.curves, before.linear]).toEqual([{}, null]);
    // No window, no exclusions: every point is a fitted one.
    const all = pointsDisplay(t, y, new Set());
    expect([all.shown.ex, all.shown.out, all.shown.total]).toEqual([[], [], n]);
    expect(all.shown.inc[0]).toBe(0);
  });
});
