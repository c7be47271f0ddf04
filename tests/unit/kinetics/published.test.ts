// Published data and constants (../shared/reference/CHECKS.md names each source; "recomputed" values there were
// recomputed from the published data with Debian's python3-scipy 1.10.1).
import { describe, expect, it } from "vitest";
import {
  arrhenius,
  BOLTZMANN_KB,
  calibrate,
  eyringFrequency,
  fitKinetics,
  GAS_R,
  halfLife,
  inversePredict,
  LN_KB_OVER_H,
  meanKineticTemperature,
  PLANCK_H,
  t90,
  twoPointEa,
} from "@/lib/kinetics";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const param = (r: ReturnType<typeof fitKinetics>, name: string) => r.parameters.find((p) => p.name === name)!;

// Crystal violet fading in hydroxide at 590 nm. Source: a public Colby College physical-chemistry course page
// ("crystal violet data"), quoted in CHECKS.md: [CV]0 = 1.2e-5 M, [OH-] = 0.0300 M, t in min, measured A_inf = 0.040.
const CV_T_MIN = [0, 1, 3, 5, 7, 9, 11, 13, 15];
const CV_A = [1.2, 0.905, 0.526, 0.317, 0.2, 0.133, 0.094, 0.071, 0.058];
const CV_T = CV_T_MIN.map((m) => m * 60);

describe("crystal violet, nonlinear first-order fit (CHECKS.md, recomputed with scipy)", () => {
  const r = fitKinetics(CV_T, CV_A, { model: "first-order" });

  it("matches A0, A_inf, k with their SEs, SSR and dof", () => {
    expect(r.converged).toBe(true);
    expect(param(r, "a0").value).toBeCloseTo(1.19781, 5);
    expect(param(r, "a0").se).toBeCloseTo(0.00239, 5);
    expect(param(r, "ainf").value).toBeCloseTo(0.04602, 5);
    expect(param(r, "ainf").se).toBeCloseTo(0.00191, 5);
    // k per second here; CHECKS gives 0.29020 ± 0.00192 per minute.
    expect(rel(param(r, "k").value! * 60, 0.2902)).toBeLessThan(2e-4);
    expect(rel(param(r, "k").se! * 60, 0.00192)).toBeLessThan(3e-3);
    expect(rel(r.ssr!, 4.36e-5)).toBeLessThan(1e-3);
    expect(r.dof).toBe(6);
  });

  it("gives the AICc, runs and Durbin–Watson of the command-line contract's example (its values come from this data)", () => {
    // ../shared/contracts/CLI.md example: aicc -99.34, runs 4, durbin_watson 1.11.
    expect(r.aicc).toBeCloseTo(-99.34, 2);
    expect(r.runs).toBe(4);
    expect(r.durbin_watson).toBeCloseTo(1.11, 2);
  });

  it("gives t1/2 = 2.389 min and k2 = k/[OH-] = 0.1612 M^-1 s^-1 (literature 0.161, J. Chem. Educ.)", () => {
    const k = param(r, "k").value!;
    expect(halfLife(k).value / 60).toBeCloseTo(2.389, 3);
    expect(k / 0.03).toBeCloseTo(0.1612, 4);
    expect(t90(k).value).toBeCloseTo(Math.log(10 / 9) / k, 12);
  });

  it("the linearized fit with the measured A_inf = 0.040 lies beside it", () => {
    const lin = fitKinetics(CV_T, CV_A, { model: "linearized", fixed: { ainf: 0.04 } });
    expect(lin.converged).toBe(true);
    expect(param(lin, "ainf")).toMatchObject({ value: 0.04, fixed: true, se: null });
    // The straight line in log units gives a nearby k (within 5 % of the nonlinear one) and an r2 near 1.
    expect(rel(param(lin, "k").value!, param(r, "k").value!)).toBeLessThan(0.05);
    expect(lin.r2!).toBeGreaterThan(0.99);
  });
});

describe("N2O5 decomposition, Arrhenius over three temperatures (CHECKS.md: textbook exercise data, recomputed)", () => {
  const points = [
    { temperatureK: 338, k: 4.9e-3 },
    { temperatureK: 318, k: 5.0e-4 },
    { temperatureK: 298, k: 3.5e-5 },
  ];
  it("Ea = 103.49 ± 0.80 kJ/mol and A = 4.88e13 s^-1", () => {
    const a = arrhenius(points);
    expect(a.ea.value / 1000).toBeCloseTo(103.49, 2);
    expect(a.ea.se! / 1000).toBeCloseTo(0.8, 2);
    expect(rel(Math.exp(a.lnA.value), 4.88e13)).toBeLessThan(2e-3);
    expect(a.dof).toBe(1);
  });
  it("two temperatures give the two-point Ea with no SE", () => {
    const a = arrhenius(points.slice(0, 2));
    expect(a.method).toBe("two-point");
    expect(a.ea.se).toBeNull();
    expect(a.ea.value).toBeCloseTo(twoPointEa(points[1]!, points[0]!), 6);
    expect(a.ea.value).toBeCloseTo((GAS_R * Math.log(4.9e-3 / 5.0e-4)) / (1 / 318 - 1 / 338), 6);
  });
});

describe("calibration (Harvey, Analytical Chemistry 2.0, Table 5.1; OLS recomputed in CHECKS.md)", () => {
  const conc = [0, 0.1, 0.2, 0.3, 0.4, 0.5];
  const signal = [0.0, 12.36, 24.83, 35.91, 48.79, 60.42];
  const cal = calibrate(conc, signal, { sigma: "residual" });
  it("slope 120.7057 ± 0.9641, intercept 0.2086 ± 0.2919, residual SD 0.4033", () => {
    expect(cal.slope).toBeCloseTo(120.7057, 4);
    expect(cal.seSlope).toBeCloseTo(0.9641, 4);
    expect(cal.intercept).toBeCloseTo(0.2086, 4);
    expect(cal.seIntercept).toBeCloseTo(0.2919, 4);
    expect(cal.residualSd).toBeCloseTo(0.4033, 4);
  });
  it("LOD = 3.3σ/S = 0.01103 and LOQ = 10σ/S = 0.03341 (ICH Q2(R2) formulas)", () => {
    expect(cal.lod).toBeCloseTo(0.01103, 5);
    expect(cal.loq).toBeCloseTo(0.03341, 5);
    expect(cal.sigmaSource).toBe("residual");
  });
  it("inverse prediction returns the concentration of a reading on the line", () => {
    const x0 = inversePredict(cal, [cal.intercept + cal.slope * 0.25]);
    expect(x0.value).toBeCloseTo(0.25, 12);
    expect(x0.se).toBeGreaterThan(0);
  });
});

describe("constants (SI 2019 exact, CODATA 2018; derived values recomputed in CHECKS.md)", () => {
  it("h, kB, R, ln(kB/h), kB·T/h at 298.15 K", () => {
    expect(PLANCK_H).toBe(6.62607015e-34);
    expect(BOLTZMANN_KB).toBe(1.380649e-23);
    expect(GAS_R).toBeCloseTo(8.314462618, 9);
    expect(LN_KB_OVER_H).toBeCloseTo(23.759978, 6);
    expect(rel(eyringFrequency(298.15), 6.212438e12)).toBeLessThan(1e-6);
  });
});

describe("mean kinetic temperature (CHECKS.md, recomputed)", () => {
  it("equal times at 20, 25, 30 and 35 °C with ΔH/R = 10 000 K give 29.05 °C", () => {
    const mkt = meanKineticTemperature([20, 25, 30, 35].map((c) => ({ temperatureK: c + 273.15, duration: 1 })));
    expect(mkt - 273.15).toBeCloseTo(29.05, 2);
  });
});
