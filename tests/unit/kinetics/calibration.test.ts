// Calibration lines beyond the Harvey OLS example (published.test.ts): weighted (1/x, 1/x²) and through the origin,
// checked against a general-purpose reference (Debian's python3-numpy lstsq and python3-scipy stats.f, run in the
// test), and the linearity check on a curved response.
import { describe, expect, it } from "vitest";
import { calibrate, inversePredict } from "@/lib/kinetics";
import { runPython } from "../../helpers/python";

// Harvey, Analytical Chemistry 2.0, Table 5.1 (the standards of ../shared/reference/CHECKS.md).
const HX = [0, 0.1, 0.2, 0.3, 0.4, 0.5];
const HY = [0.0, 12.36, 24.83, 35.91, 48.79, 60.42];
// The same standards without the blank (weights 1/x need x > 0).
const PX = HX.slice(1),
  PY = HY.slice(1);
// A response that bends at the top (saturation of the kind stray light causes); invented for this test only.
const CX = [0.1, 0.2, 0.4, 0.6, 0.8, 1.0, 1.2];
const CY = CX.map((c) => 1.2 * c - 0.18 * c * c + 0.002 * Math.sin(17 * c));

const cases = [
  { name: "OLS (Harvey)", x: HX, y: HY, w: HX.map(() => 1), origin: false, opts: {} },
  { name: "through the origin (Harvey)", x: HX, y: HY, w: HX.map(() => 1), origin: true, opts: { throughOrigin: true } },
  { name: "weighted 1/x (Harvey without blank)", x: PX, y: PY, w: PX.map((v) => 1 / v), origin: false, opts: { weighting: "1/x" as const } },
  { name: "weighted 1/x² (Harvey without blank)", x: PX, y: PY, w: PX.map((v) => 1 / (v * v)), origin: false, opts: { weighting: "1/x2" as const } },
  { name: "curved response", x: CX, y: CY, w: CX.map(() => 1), origin: false, opts: {} },
];
const ref = runPython<{ numpy: string; cases: Array<{ slope: number; se_slope: number; intercept?: number; se_intercept?: number; residual_sd: number; mandel_p: number }> }>(
  "tests/reference/numpy_calibration.py",
  cases.map(({ x, y, w, origin }) => ({ x, y, w, origin })),
);

describe(`calibration lines agree with numpy ${ref.numpy} lstsq`, () => {
  cases.forEach((c, i) => {
    it(`${c.name}: slope, intercept and their SEs to 1e-9 relative; Mandel p to 1e-6`, () => {
      const cal = calibrate(c.x, c.y, c.opts);
      const r = ref.cases[i]!;
      const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
      expect(rel(cal.slope, r.slope)).toBeLessThan(1e-9);
      expect(rel(cal.seSlope, r.se_slope)).toBeLessThan(1e-9);
      if (!c.origin) {
        expect(rel(cal.intercept, r.intercept!)).toBeLessThan(1e-7);
        expect(rel(cal.seIntercept!, r.se_intercept!)).toBeLessThan(1e-9);
      } else {
        expect(cal.intercept).toBe(0);
        expect(cal.seIntercept).toBeNull();
      }
      expect(rel(cal.residualSd, r.residual_sd)).toBeLessThan(1e-9);
      expect(Math.abs(cal.linearity.quadratic!.p - r.mandel_p)).toBeLessThan(1e-6);
    });
  });

  it("flags the curved response as not linear (Mandel p < 0.05) and the Harvey line as linear", () => {
    expect(calibrate(CX, CY).linearity.linear).toBe(false);
    expect(calibrate(CX, CY).warnings.join(" ")).toMatch(/quadratic term is significant/);
    expect(calibrate(HX, HY).linearity.linear).toBe(true);
  });

  it("refuses 1/x weights with a zero-concentration standard, and σ from the intercept through the origin", () => {
    expect(() => calibrate(HX, HY, { weighting: "1/x" })).toThrow(/above zero/);
    expect(() => calibrate(HX, HY, { throughOrigin: true, sigma: "intercept" })).toThrow(/intercept/);
  });

  it("inverse prediction SE: Miller & Miller's formula for an unweighted line (recomputed by hand from the Harvey fit)", () => {
    const cal = calibrate(HX, HY);
    const y0 = 29.32; // three replicate readings averaging 29.32
    const { value, se } = inversePredict(cal, [29.2, 29.32, 29.44]);
    const f = cal.fit;
    const ybar = HY.reduce((a, b) => a + b, 0) / HY.length;
    const expected = (f.residualSd / f.slope) * Math.sqrt(1 / 3 + 1 / 6 + (y0 - ybar) ** 2 / (f.slope ** 2 * f.sxx));
    expect(value).toBeCloseTo((y0 - f.intercept) / f.slope, 12);
    expect(se).toBeCloseTo(expected, 12);
  });
});
