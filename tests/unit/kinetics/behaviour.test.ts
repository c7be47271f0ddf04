// The engine's health reporting and model behaviour. Expected values are exact algebra on small made-up inputs
// (common practice) unless a source is named.
import { describe, expect, it } from "vitest";
import {
  akaikeWeights,
  aicc,
  arrhenius,
  beerLambertConcentration,
  durbinWatson,
  extraSumOfSquaresF,
  fitKinetics,
  fitLine,
  firstOrderRate,
  localTangentRate,
  predictRateConstant,
  q10,
  runsTest,
  secondOrderFromObserved,
  transmittanceToAbsorbance,
  TemperatureDataError,
} from "@/lib/kinetics";
import { seededRandom } from "../../helpers/random";

const t = Array.from({ length: 30 }, (_, i) => i * 20);
const decay = t.map((ti) => 0.05 + 0.9 * Math.exp(-0.004 * ti));
const rise = t.map((ti) => 0.8 - 0.7 * Math.exp(-0.004 * ti));
const p = (r: ReturnType<typeof fitKinetics>, n: string) => r.parameters.find((q) => q.name === n)!;

describe("failures are reported in plain words", () => {
  it("fewer points than parameters", () => {
    const r = fitKinetics([0, 1], [1, 0.5], { model: "first-order" });
    expect(r.converged).toBe(false);
    expect(r.message).toMatch(/2 points cannot determine 3 free parameters/);
    expect(r.parameters.every((q) => q.value === null)).toBe(true);
  });
  it("all-equal values", () => {
    expect(fitKinetics(t, t.map(() => 0.5), { model: "first-order" }).message).toMatch(/all values are equal/);
  });
  it("NaN and infinite values", () => {
    const y = [...decay];
    y[4] = NaN;
    expect(fitKinetics(t, y, { model: "first-order" }).message).toMatch(/point 5 is not a finite number/);
    y[4] = Infinity;
    expect(fitKinetics(t, y, { model: "first-order" }).converged).toBe(false);
  });
  it("a formula that cannot converge says so and returns no start values", () => {
    // exp(50·t) overflows from every start tried (the start, ×0.1 and ×10).
    const r = fitKinetics(t, decay, { formula: "b1*exp(b2*t)", start: { b1: 1, b2: 50 } });
    expect(r.converged).toBe(false);
    expect(r.message).toMatch(/The fit failed/);
    expect(r.parameters.map((q) => q.value)).toEqual([null, null]);
  });
  it("a parameter on its bound gets no SE, with the reason", () => {
    // Exponential growth cannot be a first-order approach with k >= 0: the best k is the bound, 0.
    const growth = t.map((ti) => 0.1 + 0.05 * Math.exp(0.004 * ti));
    const r = fitKinetics(t, growth, { model: "first-order", fixed: { ainf: 0.1 } });
    expect(r.converged, r.message).toBe(true);
    expect(p(r, "k").value).toBe(0);
    expect(p(r, "k").se).toBeNull();
    expect(r.message).toMatch(/Standard errors are not given for k: the estimate sits on its bound/);
  });
  it("unknown model and unknown parameter names are refused", () => {
    expect(() => fitKinetics(t, decay, { model: "third-order" })).toThrow(/There is no model "third-order"/);
    expect(() => fitKinetics(t, decay, { model: "first-order", fixed: { q: 1 } })).toThrow(/"q" is not a parameter of first-order/);
  });
  it("times before zero are legitimate", () => {
    const tt = t.map((v) => v - 100);
    const r = fitKinetics(tt, decay, { model: "first-order" });
    expect(r.converged).toBe(true);
    expect(p(r, "k").value).toBeCloseTo(0.004, 9);
  });
});

describe("first-order model", () => {
  it("fits decays and rises exactly from automatic starts", () => {
    for (const y of [decay, rise]) {
      const r = fitKinetics(t, y, { model: "first-order" });
      expect(r.converged).toBe(true);
      expect(p(r, "k").value).toBeCloseTo(0.004, 10);
    }
    expect(p(fitKinetics(t, rise, { model: "first-order" }), "ainf").value).toBeCloseTo(0.8, 9);
  });
  it("a fixed parameter is held, has no SE and does not count in dof or K", () => {
    const rnd = seededRandom(1);
    const y = decay.map((v) => v + 0.002 * rnd.normal());
    const free = fitKinetics(t, y, { model: "first-order" });
    const held = fitKinetics(t, y, { model: "first-order", fixed: { ainf: 0.05 } });
    expect(p(held, "ainf")).toMatchObject({ value: 0.05, fixed: true, se: null, ci95: null });
    expect(held.dof).toBe(free.dof + 1);
    expect(held.aicc).toBeCloseTo(aicc(held.ssr!, t.length, 2)!, 10);
  });
  it("the 95 % CI is value ± t(0.975, dof)·SE", () => {
    const rnd = seededRandom(2);
    const r = fitKinetics(t, decay.map((v) => v + 0.003 * rnd.normal()), { model: "first-order" });
    const k = p(r, "k");
    // t(0.975, 27) = 2.0518 (statistical tables)
    expect((k.ci95![1] - k.value!) / k.se!).toBeCloseTo(2.0518, 3);
  });
  it("relative weights leave the estimates of exact data unchanged; absolute σ scales the SEs", () => {
    const rnd = seededRandom(3);
    const y = decay.map((v) => v + 0.003 * rnd.normal());
    const w2 = fitKinetics(t, y, { model: "first-order", weighting: { kind: "relative", weights: t.map(() => 2) } });
    const w1 = fitKinetics(t, y, { model: "first-order" });
    expect(p(w2, "k").value).toBeCloseTo(p(w1, "k").value!, 12);
    expect(p(w2, "k").se).toBeCloseTo(p(w1, "k").se!, 12);
    const abs = fitKinetics(t, y, { model: "first-order", weighting: { kind: "absolute", sigma: t.map(() => 0.003) } });
    const s = Math.sqrt(w1.ssr! / w1.dof);
    expect(p(abs, "k").se! / p(w1, "k").se!).toBeCloseTo(0.003 / s, 8);
  });
});

describe("other models", () => {
  it("zero order recovers a straight line", () => {
    const y = t.map((ti) => 1 - 0.0005 * ti);
    const r = fitKinetics(t, y, { model: "zero-order" });
    expect(p(r, "k").value).toBeCloseTo(0.0005, 12);
  });
  it("second order recovers 1/y = 1/a0 + k t", () => {
    const y = t.map((ti) => 1 / (1 / 0.8 + 0.01 * ti));
    const r = fitKinetics(t, y, { model: "second-order" });
    expect(p(r, "a0").value).toBeCloseTo(0.8, 9);
    expect(p(r, "k").value).toBeCloseTo(0.01, 9);
  });
  it("two exponentials are labelled k1 > k2 and the exchange is flagged", () => {
    const tt = Array.from({ length: 80 }, (_, i) => i * 10);
    const y = tt.map((ti) => 0.1 + 0.5 * Math.exp(-0.002 * ti) + 0.4 * Math.exp(-0.02 * ti));
    const r = fitKinetics(tt, y, { model: "biexponential" });
    expect(r.converged, r.message).toBe(true);
    expect(p(r, "k1").value).toBeCloseTo(0.02, 8);
    expect(p(r, "k2").value).toBeCloseTo(0.002, 8);
    expect(p(r, "a1").value).toBeCloseTo(0.4, 7);
    expect(r.warnings.join(" ")).toMatch(/k1 and k2 can be exchanged/);
  });
  it("Guggenheim and Kezdy–Swinbourne recover k without A∞", () => {
    const g = fitKinetics(t, decay, { model: "guggenheim", interval: 200 });
    expect(p(g, "k").value).toBeCloseTo(0.004, 10);
    const ks = fitKinetics(t, decay, { model: "kezdy-swinbourne", interval: 200 });
    expect(p(ks, "k").value).toBeCloseTo(0.004, 10);
    expect(p(ks, "ainf").value).toBeCloseTo(0.05, 10);
    expect(fitKinetics(t, decay, { model: "guggenheim" }).message).toMatch(/needs an interval/);
  });
  it("an interval off the readings' grid: kept as asked by default (no pairs, said plainly), moved to the nearest spacing that pairs readings when asked to snap", () => {
    const asked = 205; // the readings are every 20 s here (common practice: pairs need readings exactly Δ apart)
    const exact = fitKinetics(t, decay, { model: "guggenheim", interval: asked });
    expect(exact.converged).toBe(false);
    expect(exact.message).toMatch(/no pairs of readings are 205 s apart; choose an interval that is a multiple of the readings' spacing/);
    expect(exact.message).not.toMatch(/--/);
    const snapped = fitKinetics(t, decay, { model: "guggenheim", interval: asked, snapInterval: true });
    expect(snapped.converged).toBe(true);
    expect(p(snapped, "k").value).toBeCloseTo(0.004, 10);
    expect(snapped.warnings.join(" ")).toMatch(/No readings are 205 s apart; the nearest interval that pairs them, 200 s \(10 × the 20 s spacing of the readings\), was used\./);
    const ks = fitKinetics(t, decay, { model: "kezdy-swinbourne", interval: asked, snapInterval: true });
    expect(p(ks, "k").value).toBeCloseTo(0.004, 10);
  });
  it("the linearized fit without A∞ says it was estimated", () => {
    const r = fitKinetics(t, decay, { model: "linearized" });
    expect(r.message).toMatch(/estimated by the nonlinear first-order fit/);
    expect(p(r, "k").value).toBeCloseTo(0.004, 8);
  });
  it("user formulas find their parameters and use standard notation", () => {
    const y = t.map((ti) => 2 * (1 - Math.exp(-0.01 * ti)) + Math.atan(1) * 0);
    const r = fitKinetics(t, y, { formula: "b1*(1-exp(-b2*t)) + 0*atan(pi)", start: { b1: 1, b2: 0.02 } });
    expect(r.parameters.map((q) => q.name)).toEqual(["b1", "b2"]);
    expect(p(r, "b2").value).toBeCloseTo(0.01, 10);
    expect(() => fitKinetics(t, y, { formula: "b1*(1-exp(-b2*x))" })).toThrow(/does not use the time variable "t"/);
    expect(() => fitKinetics(t, y, { formula: "b1*(1-exp(" })).toThrow(/cannot be read/);
  });
});

describe("diagnostics (definitions from the command-line contract and METHODS.md)", () => {
  it("runs test and Durbin–Watson on a small hand-checked residual vector", () => {
    const e = [1, 2, -1, -1, 3, -2];
    const rt = runsTest(e);
    expect(rt.runs).toBe(4); // + + | − − | + | −
    expect(rt.expected).toBeCloseTo((2 * 3 * 3) / 6 + 1, 12);
    // Σ(Δe)² = 1 + 9 + 0 + 16 + 25 = 51, Σe² = 20
    expect(durbinWatson(e)).toBeCloseTo(51 / 20, 12);
  });
  it("AICc, Akaike weights and the extra-sum-of-squares F test", () => {
    expect(aicc(2, 10, 2)).toBeCloseTo(10 * Math.log(0.2) + 4 + 12 / 7, 12);
    const w = akaikeWeights([10, 12, null]);
    expect(w[0]! + w[1]!).toBeCloseTo(1, 12);
    expect(w[0]! / w[1]!).toBeCloseTo(Math.exp(1), 12);
    expect(w[2]).toBeNull();
    const f = extraSumOfSquaresF({ ssr: 10, dof: 20 }, { ssr: 5, dof: 18 })!;
    expect(f.f).toBeCloseTo(((10 - 5) / 2) / (5 / 18), 12);
    expect(f.p).toBeGreaterThan(0);
    expect(f.p).toBeLessThan(0.01);
  });
});

describe("quantities", () => {
  it("%T to absorbance, Beer–Lambert with blank and dilution", () => {
    expect(transmittanceToAbsorbance(10)).toBeCloseTo(1, 14);
    expect(transmittanceToAbsorbance(100)).toBe(0);
    // NADH at 340 nm, ε = 6220 L mol⁻¹ cm⁻¹ (CHECKS.md, widely tabulated)
    expect(beerLambertConcentration(0.672, { epsilon: 6220, pathLengthCm: 1, blank: 0.05, dilution: 2 })).toBeCloseTo((0.622 / 6220) * 2, 14);
  });
  it("instantaneous rate from the model and a local tangent from the data agree on exact data", () => {
    const model = firstOrderRate({ a0: 0.95, ainf: 0.05, k: 0.004 }, 200);
    const tangent = localTangentRate(t, decay, 200, 20);
    expect(tangent.rate / model).toBeCloseTo(1, 2);
  });
  it("k2 from k_obs at several excess concentrations is the slope", () => {
    const b = [0.01, 0.02, 0.03, 0.04];
    const r = secondOrderFromObserved(b, b.map((c) => 0.16 * c + 1e-5));
    expect(r.k2).toBeCloseTo(0.16, 10);
  });
  it("Q10 and prediction at a temperature, with an extrapolation caution", () => {
    expect(q10({ temperatureK: 298.15, k: 1 }, { temperatureK: 308.15, k: 2.5 })).toBeCloseTo(2.5, 12);
    const pts = [25, 40, 50, 60].map((c) => ({ temperatureK: c + 273.15, k: Math.exp(30 - 90000 / (8.314462618 * (c + 273.15))) }));
    const pr = predictRateConstant(pts, 5 + 273.15);
    expect(pr.extrapolated).toBe(true);
    expect(pr.warning).toMatch(/extrapolation.*qualified review/);
    expect(pr.k).toBeCloseTo(Math.exp(30 - 90000 / (8.314462618 * 278.15)), 15);
  });
  it("refuses temperatures below absolute zero and non-positive rate constants", () => {
    expect(() => arrhenius([{ temperatureK: 300, k: 1 }, { temperatureK: 310, k: 0 }])).toThrow(TemperatureDataError);
    expect(() => arrhenius([{ temperatureK: 300, k: 1 }])).toThrow(/two temperatures/);
  });
  it("weighted Arrhenius uses (k/se)² weights", () => {
    const pts = [20, 30, 40].map((c, i) => ({ temperatureK: c + 273.15, k: Math.exp(25 - 80000 / (8.314462618 * (c + 273.15))) * (1 + [0.01, -0.02, 0.015][i]!), se: 0.01 * (i + 1) }));
    const a = arrhenius(pts.map((q) => ({ ...q, se: q.se * q.k })));
    const line = fitLine(pts.map((q) => 1 / q.temperatureK), pts.map((q) => Math.log(q.k)), { weights: pts.map((q) => 1 / q.se ** 2) });
    expect(a.weighted).toBe(true);
    expect(a.ea.value).toBeCloseTo(-line.slope * 8.314462618, 4);
  });
});

describe("long series", () => {
  it("the normal-equations path (used from 1 000 points) agrees with the QR path", async () => {
    const { fitNonlinear } = await import("@/lib/kinetics");
    const { firstOrderFunction: m } = await import("@/lib/kinetics/models/first-order");
    const rnd = seededRandom(11);
    const n = 30_000;
    const tt = Float64Array.from({ length: n }, (_, i) => i * 0.05);
    const y = tt.map((ti) => 0.07 + 0.9 * Math.exp(-0.002 * ti) + 0.003 * rnd.normal());
    const fast = fitKinetics(tt, y, { model: "first-order" });
    const qr = fitNonlinear("first-order", m, tt, y, { start: m.starts(tt, y, {})[0]!, lower: m.lower, solver: "qr" });
    for (const name of ["a0", "ainf", "k"]) {
      expect(Math.abs(p(fast, name).value! / p(qr, name).value! - 1)).toBeLessThan(1e-9);
      expect(Math.abs(p(fast, name).se! / p(qr, name).se! - 1)).toBeLessThan(1e-7);
    }
  });
});

describe("the series workspace", () => {
  it("applies window and exclusions, compares models, and turns an unreadable formula into a failed model", async () => {
    const { fitSeriesWithOptions } = await import("@/lib/kinetics");
    const out = fitSeriesWithOptions(t, decay, { models: ["first-order", "zero-order", "formula"], formula: "b1*(", window: { from: 40 }, exclusions: [{ index: 5, reason: "spike" }] });
    expect(out.n).toBe(t.length - 2 - 1);
    expect(out.included[0]).toBe(false);
    expect(out.included[5]).toBe(false);
    expect(out.models[2]!.result.converged).toBe(false);
    expect(out.models[2]!.result.message).toMatch(/cannot be read/);
    expect(out.favoured?.model).toBe("first-order");
    expect(out.models[0]!.halfLife!.value).toBeCloseTo(Math.LN2 / 0.004, 6);
  });
});

describe("prediction intervals", () => {
  it("for an unweighted line: t·s·sqrt(1 + 1/n + d²/Sxx), the textbook formula", async () => {
    const { fitLine, predictLine } = await import("@/lib/kinetics");
    const x = [1, 2, 3, 4, 5, 6];
    const y = [2.1, 3.9, 6.2, 7.8, 10.1, 12.2];
    const f = fitLine(x, y);
    const s = f.residualSd;
    const sxx = x.reduce((a, v) => a + (v - 3.5) ** 2, 0);
    expect(predictLine(f, 8).sePrediction).toBeCloseTo(s * Math.sqrt(1 + 1 / 6 + (8 - 3.5) ** 2 / sxx), 12);
  });
  it("for a weighted line, a new observation has the data's mean weight (scaling all weights changes nothing)", async () => {
    const { fitLine, predictLine } = await import("@/lib/kinetics");
    const x = [1, 2, 3, 4, 5];
    const y = [1.1, 1.9, 3.2, 3.9, 5.1];
    const w = [1, 2, 1, 3, 2];
    const a = predictLine(fitLine(x, y, { weights: w }), 6);
    const b = predictLine(fitLine(x, y, { weights: w.map((v) => v * 1e4) }), 6);
    expect(b.sePrediction).toBeCloseTo(a.sePrediction, 12);
  });
});
