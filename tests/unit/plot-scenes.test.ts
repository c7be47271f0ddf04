// The plots a reviewer signs (lib/reports/fit-plot.ts, rate-plot.ts): axes with nice ticks (1, 2, 5 × 10ⁿ, the common
// axis-labelling rule) that span every point and label every tick, and the Arrhenius / Eyring scenes with their bars,
// line and band placed where the numbers say.
import { describe, expect, it } from "vitest";
import { ticks } from "@/lib/reports/fit-plot";
import { ratePlotScene, residualPanelsScene } from "@/lib/reports/rate-plot";
import { arrhenius, celsiusToKelvin, eyringLine } from "@/lib/kinetics/temperature";

describe("axis ticks", () => {
  const cases: Array<[number, number, number]> = [
    [-0.0042, 0.0042, 2],
    [3.047, 3.45, 5],
    [0, 1785, 6],
    [0.04, 0.93, 5],
    [1e-5, 3e-4, 4],
    [-7.2, -3.1, 5],
    [5, 5, 4],
  ];
  for (const [lo, hi, count] of cases)
    it(`${lo} … ${hi}: nice steps, the frame spans the data, at least two labelled ticks`, () => {
      const t = ticks(lo, hi, count);
      expect(t.values.length).toBeGreaterThanOrEqual(2);
      expect(t.lo).toBeLessThanOrEqual(lo);
      expect(t.hi).toBeGreaterThanOrEqual(hi);
      const step = t.values[1]! - t.values[0]!;
      const mant = step / 10 ** Math.floor(Math.log10(step) + 1e-9);
      expect([1, 2, 5, 10].some((m) => Math.abs(mant - m) < 1e-6)).toBe(true);
      const labels = t.ticks((v) => v).map((x) => x.label);
      expect(new Set(labels).size).toBe(labels.length);
    });
});

describe("rate plots", () => {
  // Rate constants from Ea = 80 kJ/mol (generated here, round numbers; not measured).
  const members = [25, 35, 45, 55].map((c) => ({ temperature_used_c: c, k: 1e-3 * Math.exp((-80_000 / 8.314462618) * (1 / celsiusToKelvin(c) - 1 / celsiusToKelvin(25))), se: 2e-5 }));

  it("Arrhenius: a dot per rate constant with its ±1 SE bar, the line through them, a band around the line", () => {
    const s = ratePlotScene("arrhenius", members, true);
    const p = s.panels[0]!;
    expect(p.points).toHaveLength(4);
    expect(p.bars).toHaveLength(4);
    expect(p.band!.length).toBe(41);
    expect(p.xLabel).toBe("1000 / T (K⁻¹)");
    // Every dot inside the frame; exact data lie on the line (the line passes within a pixel of each dot).
    for (const q of p.points) {
      expect(q.x).toBeGreaterThanOrEqual(p.x);
      expect(q.x).toBeLessThanOrEqual(p.x + p.w);
      const nearest = p.line.reduce((a, b) => (Math.abs(b[0] - q.x) < Math.abs(a[0] - q.x) ? b : a));
      expect(Math.abs(nearest[1] - q.y)).toBeLessThan(2);
    }
    for (const [, hi, lo] of p.band!) expect(hi).toBeLessThanOrEqual(lo + 1e-9);
  });

  it("Eyring: ln(k/T), the line agreeing with ΔH‡ and ΔS‡ from the Arrhenius fit", () => {
    const s = ratePlotScene("eyring", members, false);
    const p = s.panels[0]!;
    expect(p.yLabel).toBe("ln (k / T)");
    const a = arrhenius(members.map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c), k: m.k, se: null })));
    // Points of the drawn line, mapped back to data units through the axis ticks, lie on the Eyring line of ΔH‡ and ΔS‡.
    const value = (label: string) => Number(label.replace("−", "-"));
    const inv = (tk: Array<{ at: number; label: string }>) => {
      const [f, l] = [tk[0]!, tk.at(-1)!];
      return (at: number) => value(f.label) + ((at - f.at) * (value(l.label) - value(f.label))) / (l.at - f.at);
    };
    const xOf = inv(p.xTicks),
      yOf = inv(p.yTicks);
    expect(p.line.length).toBe(41);
    for (const [x, y] of [p.line[5]!, p.line[20]!, p.line[35]!]) {
      const T = 1000 / xOf(x);
      expect(Math.abs(yOf(y) - eyringLine(a.eyring, T))).toBeLessThan(0.01);
    }
  });

  it("residual panels: one per run on one scale, a zero rule in each", () => {
    const s = residualPanelsScene([
      { label: "run A", t: [0, 10, 20, 30], r: [0.001, -0.002, 0.0015, -0.0005] },
      { label: "run B", t: [0, 60, 120], r: [0.004, -0.003, 0.001] },
    ]);
    expect(s.panels).toHaveLength(2);
    expect(s.panels[0]!.xLabel).toBe("run A: t (s)");
    expect(s.panels.map((p) => p.yTicks.map((x) => x.label))).toEqual([s.panels[1]!.yTicks.map((x) => x.label), s.panels[1]!.yTicks.map((x) => x.label)]);
    for (const p of s.panels) expect(p.rule).toBeGreaterThan(p.y);
  });
});
