// What the engine says about its own results: any time origin gives the same k, amplitudes out of range are said,
// and each warning a reviewer acts on appears on a case built for it and not on a clean trace.
import { describe, expect, it } from "vitest";
import { arrhenius, fitKinetics, fitSeriesWithOptions, GAS_R, LN_KB_OVER_H, type FitResult } from "@/lib/kinetics";
import { runPython } from "../../helpers/python";
import { seededRandom } from "../../helpers/random";

const SHIFT = 1.7e9; // a Unix time stamp of late 2023, in seconds
const p = (r: FitResult, name: string) => r.parameters.find((q) => q.name === name)!;
const rel = (a: number, b: number) => Math.abs(a / b - 1);
const t = Array.from({ length: 60 }, (_, i) => 30 + i * 30);

function traces(seed: number) {
  const rnd = seededRandom(seed);
  return {
    first: t.map((x) => 0.05 + 0.9 * Math.exp(-0.002 * x) + 0.003 * rnd.normal()),
    second: t.map((x) => 0.9 / (1 + 0.9 * 0.004 * x) + 0.003 * rnd.normal()),
    two: t.map((x) => 0.05 + 0.5 * Math.exp(-0.01 * x) + 0.4 * Math.exp(-0.001 * x) + 0.002 * rnd.normal()),
  };
}

describe("any time origin: times of the size of Unix time (t + 1.7e9 s) give the same fit", () => {
  const d = traces(2026);
  const shifted = t.map((x) => x + SHIFT);
  const cases: Array<[string, number[], string[]]> = [
    ["first-order", d.first, ["k", "ainf"]],
    ["second-order", d.second, ["k"]],
    ["biexponential", d.two, ["k1", "k2", "c"]],
  ];
  for (const [model, y, names] of cases)
    it(`${model}: ${names.join(", ")} and their SEs agree to 1e-9 relative; the amplitude at t = 0 is said to be out of range`, () => {
      const a = fitKinetics(t, y, { model });
      const b = fitKinetics(shifted, y, { model });
      expect(a.converged, a.message).toBe(true);
      expect(b.converged, b.message).toBe(true);
      for (const n of names) {
        expect(rel(p(b, n).value!, p(a, n).value!), n).toBeLessThan(1e-9);
        expect(rel(p(b, n).se!, p(a, n).se!), `SE ${n}`).toBeLessThan(1e-9);
      }
      expect(b.iterations).toBeGreaterThan(0);
      // Never start values handed back: k is not the first-order rule's fallback of 1, nor the 2 / 0.5 pair.
      for (const n of names.filter((x) => x.startsWith("k"))) expect(p(b, n).value).not.toBe(1);
      const amplitudes = b.parameters.filter((q) => q.value === null);
      for (const q of amplitudes) expect(b.warnings.join(" ")).toMatch(new RegExp(`${q.name} is .*value at t = 0|${q.name} is an amplitude at t = 0`));
      if (model !== "second-order") expect(amplitudes.length).toBeGreaterThan(0);
    });

  it("first order with A∞ fixed: the same k and SE, with iterations", () => {
    const a = fitKinetics(t, d.first, { model: "first-order", fixed: { ainf: 0.05 } });
    const b = fitKinetics(shifted, d.first, { model: "first-order", fixed: { ainf: 0.05 } });
    expect(b.iterations).toBeGreaterThan(0);
    expect(rel(p(b, "k").value!, p(a, "k").value!)).toBeLessThan(1e-9);
    expect(rel(p(b, "k").se!, p(a, "k").se!)).toBeLessThan(1e-9);
  });

  it("a shift that keeps t = 0 in reach moves a0 exactly (delta method): the same as fitting in the user's times", () => {
    // Readings from 30 s: the fit runs from the first reading and reports a0 at t = 0 with its SE.
    const direct = fitKinetics(t.map((x) => x - 30), d.first, { model: "first-order" });
    const moved = fitKinetics(t, d.first, { model: "first-order" });
    // a0(t = 0) = ainf + (a0(30 s) − ainf)·exp(30 k)
    const a0at30 = p(direct, "a0").value!;
    const expected = p(direct, "ainf").value! + (a0at30 - p(direct, "ainf").value!) * Math.exp(30 * p(direct, "k").value!);
    expect(rel(p(moved, "a0").value!, expected)).toBeLessThan(1e-9);
  });

  for (const model of ["linearized", "guggenheim", "kezdy-swinbourne"])
    it(`${model}: the same k, and its amplitude or a message saying why there is none`, () => {
      const a = fitKinetics(t, d.first, { model, interval: 600 });
      const b = fitKinetics(shifted, d.first, { model, interval: 600 });
      expect(b.converged, b.message).toBe(true);
      expect(rel(p(b, "k").value!, p(a, "k").value!)).toBeLessThan(1e-6);
      for (const q of b.parameters) if (q.value === null) expect(b.warnings.join(" ")).toMatch(/out of range, so it is not given/);
    });
});

describe("warnings a reviewer can act on", () => {
  const d = traces(7);

  it("an outlying reading is named by its time, with the studentized residual numpy computes (numpy/scipy recomputation)", () => {
    const y = d.first.slice();
    y[20] = y[20]! + 0.03; // ten times the noise, at t = 630 s
    const r = fitKinetics(t, y, { model: "first-order" });
    const w = r.warnings.find((x) => /far off the fitted curve/.test(x));
    expect(w).toBeDefined();
    expect(w).toMatch(/One reading lies .*t = 630 s \(r = (\d+\.\d)\)/);
    const ours = Number(w!.match(/t = 630 s \(r = (\d+\.\d)\)/)![1]);
    const ref = runPython<{ internal: number[] }>("tests/reference/numpy_studentized.py", { t, y, p0: [0.95, 0.05, 0.002], x: [1, 2, 3, 4], v: [1, 2, 3, 4.1] });
    expect(Math.abs(ours - ref.internal[20]!)).toBeLessThanOrEqual(0.051);
    expect(fitKinetics(t, d.first, { model: "first-order" }).warnings.join(" ")).not.toMatch(/far off the fitted curve/);
  });

  it("linearized and nonlinear k that disagree beyond their uncertainties are said, with the weighted form offered (common practice: the log transform weights the tail)", () => {
    const rnd = seededRandom(7);
    for (let i = 0; i < 180; i++) rnd.normal(); // the same noise as the probe that built this case
    const noisy = t.map((x) => 0.05 + 0.9 * Math.exp(-0.004 * x) + 0.01 * rnd.normal());
    const o = fitSeriesWithOptions(t, noisy, { models: ["linearized", "first-order"] });
    const note = o.notes.find((n) => /disagree/.test(n));
    expect(note).toMatch(/times their combined standard error.*weight the linearized fit by \(y − A∞\)²/);
    const clean = fitSeriesWithOptions(t, d.first, { models: ["linearized", "first-order"] });
    expect(clean.notes.join(" ")).not.toMatch(/disagree/);
  });

  it("parameters that cannot be told apart are named; a two-exponential fit of one exponential says a single one describes it", () => {
    const one = fitKinetics(t, d.first, { model: "biexponential" });
    expect(one.warnings.join(" ")).toMatch(/two phases cannot be told apart/);
    const two = fitKinetics(t, d.two, { model: "biexponential" });
    expect(two.converged).toBe(true);
    expect(two.warnings.join(" ")).not.toMatch(/cannot be told apart/);
    // A formula with a redundant pair: a·b·exp(−k t) has a and b indistinguishable (singular covariance).
    const red = fitKinetics(t, d.first, { formula: "a*b*exp(-k*t) + c", start: { a: 1, b: 0.9, k: 0.002, c: 0.05 } });
    expect(red.warnings.join(" ")).toMatch(/a and b cannot be told apart/);
  });

  it("data with no curvature: a curved model says so, whether it fails or converges", () => {
    for (const seed of [3, 7]) {
      const rnd = seededRandom(seed);
      const line = t.map((x) => 0.9 - 0.0001 * x + 0.003 * rnd.normal());
      const r = fitKinetics(t, line, { model: "first-order" });
      expect([r.message, ...r.warnings].join(" ")).toMatch(/no curvature/);
      if (!r.converged) expect(r.parameters.every((q) => q.value === null)).toBe(true);
    }
    const clean = fitKinetics(t, d.first, { model: "first-order" });
    expect([clean.message, ...clean.warnings].join(" ")).not.toMatch(/curvature/);
  });

  it("a parameter running off towards infinity is not 'converged' (a 50 AU spike)", () => {
    const y = d.first.slice();
    y[20] = 50;
    const r = fitKinetics(t, y, { model: "first-order" });
    expect(r.converged).toBe(false);
    expect(r.message).toMatch(/ran off towards .*infinity/);
    expect(r.parameters.every((q) => q.value === null)).toBe(true);
    const f = fitKinetics(t, d.first, { formula: "a*exp(-b*t) + c" });
    expect(f.converged).toBe(false);
    expect(f.message).toMatch(/ran off towards/);
  });

  it("a poor fit from default start values says so; the same formula with starts does not", () => {
    const poor = fitKinetics(t, d.first, { formula: "a*sin(b*t) + c" });
    expect(poor.converged).toBe(true);
    expect(poor.warnings.join(" ")).toMatch(/A poor fit \(r² 0\.\d+\) from default start values/);
    const good = fitKinetics(t, d.first, { formula: "a*exp(-b*t) + c", start: { a: 1, b: 0.001, c: 0 } });
    expect(good.converged).toBe(true);
    expect(good.warnings.join(" ")).not.toMatch(/poor fit/);
  });

  it("an outlying temperature in Arrhenius is named (externally studentized residual as numpy computes it)", () => {
    // ln k on 1/T for Ea = 80 kJ/mol, ln A = 28, small scatter, 5 temperatures; the 40 °C value 1.5 times too high.
    const Tc = [20, 30, 40, 50, 60];
    const scatter = [0.01, -0.012, 0.008, -0.006, 0.009];
    const pts = Tc.map((c, i) => ({ temperatureK: c + 273.15, k: Math.exp(28 - 80000 / (GAS_R * (c + 273.15)) + scatter[i]!) }));
    expect(arrhenius(pts).warnings.join(" ")).not.toMatch(/lies off the line/);
    const bad = pts.map((q, i) => (i === 2 ? { ...q, k: q.k * 1.5 } : q));
    const w = arrhenius(bad).warnings.find((x) => /lies off the line/.test(x));
    expect(w).toMatch(/at 40\.0 °C lies off the line through the others \(studentized residual (-?\d+\.\d)/);
    const ref = runPython<{ external: number[] }>("tests/reference/numpy_studentized.py", {
      t: [0, 1, 2, 3, 4],
      y: [1, 0.6, 0.37, 0.22, 0.14],
      p0: [1, 0, 0.5],
      x: bad.map((q) => 1 / q.temperatureK),
      v: bad.map((q) => Math.log(q.k)),
    });
    expect(Math.abs(Number(w!.match(/residual (-?\d+\.\d)/)![1]) - ref.external[2]!)).toBeLessThanOrEqual(0.051);
  });
});

describe("two-point Eyring from the line through the two points", () => {
  it("recovers ΔH‡ and ΔS‡ of rate constants generated by the Eyring equation (k = kB·T/h · exp(ΔS‡/R − ΔH‡/(R·T)))", () => {
    const dH = 85_000,
      dS = -40;
    const k = (T: number) => T * Math.exp(LN_KB_OVER_H + dS / GAS_R - dH / (GAS_R * T));
    const a = arrhenius([{ temperatureK: 298.15, k: k(298.15) }, { temperatureK: 318.15, k: k(318.15) }]);
    expect(a.method).toBe("two-point");
    expect(rel(a.eyring.dH.value, dH)).toBeLessThan(1e-9);
    expect(Math.abs(a.eyring.dS.value - dS)).toBeLessThan(1e-6);
  });
});

describe("plot-ready results from the engine", () => {
  it("the linearized view is ln|y − A∞| of the points the line used, and the line's ends (definition of the method)", () => {
    const d = traces(11);
    const o = fitSeriesWithOptions(t, d.first, { models: ["linearized", "first-order"] });
    const lin = o.models.find((m) => m.model === "linearized")!.result;
    const ainf = lin.parameters.find((q) => q.name === "ainf")!.value!;
    const k = lin.parameters.find((q) => q.name === "k")!.value!;
    const v = o.linearized_view!;
    v.t.forEach((ti, i) => expect(v.ln[i]).toBeCloseTo(Math.log(Math.abs(d.first[t.indexOf(ti)]! - ainf)), 12));
    expect((v.line.ln[1] - v.line.ln[0]) / (v.line.t[1] - v.line.t[0])).toBeCloseTo(-k, 12);
    expect(fitSeriesWithOptions(t, d.first, { models: ["first-order"] }).linearized_view).toBeNull();
  });
});
