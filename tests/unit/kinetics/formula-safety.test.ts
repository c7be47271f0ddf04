// User formulas under hostile input: bounded, allow-listed, compiled or refused quickly; derivatives that survive t = 0.
import { describe, expect, it } from "vitest";
import { fitKinetics } from "@/lib/kinetics";
import { compileFormula, FormulaError, MAX_FORMULA_LENGTH } from "@/lib/kinetics/formula";
import { runPython } from "../../helpers/python";
import { PATHOLOGICAL_FORMULAS } from "../../helpers/formulas";
import { seededRandom } from "../../helpers/random";


describe("formulas are compiled or refused without delay (the time is measured by the bench, not here)", () => {
  for (const { label, formula } of PATHOLOGICAL_FORMULAS) {
    it(`${label} (${formula.length} characters)`, () => {
      expect(formula.length).toBeLessThanOrEqual(MAX_FORMULA_LENGTH);
      try {
        const f = compileFormula(formula);
        // Compiled: it evaluates and gives a Jacobian of the right shape.
        const t = Float64Array.from([0, 1, 2]);
        const p = f.params.map(() => 0.5);
        const J = new Float64Array(3 * f.params.length);
        f.jacobian(t, p, J);
        expect(J.length).toBe(3 * f.params.length);
      } catch (e) {
        expect(e).toBeInstanceOf(FormulaError);
        expect((e as Error).message).toMatch(/at most|more than|not allowed/);
      }
    });
  }

  it("a formula longer than the limit is refused before it is read", () => {
    expect(() => compileFormula("a*t+" + "1+".repeat(1500) + "1")).toThrow(`at most ${MAX_FORMULA_LENGTH} are read`);
  });
});

describe("only an allow-list of functions, names and operators", () => {
  const refused: Array<[string, RegExp]> = [
    ['a*t + evaluate("sum(1:20000)")', /the function "evaluate"/],
    ['a*t + import({x: 1})', /the function "import"/],
    ['createUnit("foo") + a*t', /the function "createUnit"/],
    ["a*t + config({})", /the function "config"/],
    ["a*t + sum(1:20000)", /the function "sum"/],
    ["a*t + frobnicate(t)", /the function "frobnicate"/],
    ["a*t + [1,2][1]", /matrix|index/],
    ["f(x) = x; a*t", /assignment|several statements/],
    ["a*t + (t > 1 ? 1 : 0)", /condition|comparison/],
    ["a*t + 5!", /operator "!"/],
    ['a*t + "1"', /constant/],
    ["a*t + exp", /"exp" without brackets/],
    ["a*t + exp(t, 2)", /with 2 arguments/],
    ["a*t + b.c", /index or property access|name/],
  ];
  for (const [formula, why] of refused)
    it(`refuses ${formula}`, () => {
      expect(() => compileFormula(formula)).toThrow(FormulaError);
      expect(() => compileFormula(formula)).toThrow(why);
    });

  it("the refusal names every function it cannot use and lists the ones it can", () => {
    expect(() => compileFormula('evaluate("1") + createUnit("x") + a*t')).toThrow(/"evaluate".*"createUnit".*exp, log/);
  });

  it("keeps the usual kinetic formulas", () => {
    for (const f of ["ainf + (a0 - ainf)*exp(-k*t)", "a0/(1 + a0*k*t)", "y = c + a1*exp(-k1*t) + a2*exp(-k2*t)", "a*exp(-(k*t)^beta) + c", "a*t**2 + b*sqrt(t) + log(c)"])
      expect(compileFormula(f).params.length).toBeGreaterThan(0);
  });
});

describe("a stretched exponential with a reading at t = 0", () => {
  // Generated data (seeded): a = 0.8, k = 0.004 s⁻¹, beta = 0.6, c = 0.05, σ = 0.002, t = 0…900 s every 15 s.
  const rnd = seededRandom(2026_12_02);
  const t = Array.from({ length: 61 }, (_, i) => i * 15);
  const y = t.map((x) => 0.8 * Math.exp(-((0.004 * x) ** 0.6)) + 0.05 + 0.002 * rnd.normal());
  const start = { a: 0.7, beta: 0.7, c: 0.04, k: 0.005 };
  const ref = runPython<{ scipy: string; fits: Array<{ params: number[]; se: number[] }> }>("tests/reference/scipy_stretched.py", [
    { t, y, p0: [start.a, start.beta, start.c, start.k] },
  ]);

  it(`fits and matches scipy ${ref.scipy} curve_fit (trf) in every parameter and SE`, () => {
    const r = fitKinetics(t, y, { formula: "a*exp(-(k*t)^beta) + c", start });
    expect(r.converged, r.message).toBe(true);
    const s = ref.fits[0]!;
    ["a", "beta", "c", "k"].forEach((name, j) => {
      const p = r.parameters.find((q) => q.name === name)!;
      expect(Math.abs(p.value! - s.params[j]!) / Math.abs(s.params[j]!), name).toBeLessThan(1e-6);
      expect(Math.abs(p.se! - s.se[j]!) / s.se[j]!, `SE ${name}`).toBeLessThan(1e-3);
    });
  });
});
