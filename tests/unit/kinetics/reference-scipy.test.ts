// Differential test against a general-purpose reference library: Debian's python3-scipy, scipy.optimize.curve_fit
// (method "trf", analytic Jacobian, tolerances 1e-15), run in the same test on the same generated traces.
import { describe, expect, it } from "vitest";
import { fitKinetics } from "@/lib/kinetics";
import { runPython } from "../../helpers/python";
import { firstOrderTraces } from "../../helpers/random";

describe("first-order fits agree with scipy curve_fit", () => {
  const traces = firstOrderTraces(20261202);
  const ref = runPython<{ scipy: string; fits: Array<{ params: number[]; se: number[] }> }>("tests/reference/scipy_first_order.py", traces.map((tr) => ({ t: tr.t, y: tr.y, p0: [tr.truth.a0 * 1.1, tr.truth.ainf * 0.9, tr.truth.k * 1.2] })));

  it(`covers ${traces.length} traces (decays and rises, 1–8 half-lives, 3 noise levels, t in s and min) with scipy ${ref.scipy}`, () => {
    expect(ref.fits).toHaveLength(traces.length);
    expect(traces.length).toBe(48);
  });

  traces.forEach((tr, i) => {
    it(`${tr.label}: k to 6 digits, SE(k) to 4 digits`, () => {
      const ours = fitKinetics(tr.t, tr.y, { model: "first-order" });
      expect(ours.converged, ours.message).toBe(true);
      const s = ref.fits[i]!;
      const names = ["a0", "ainf", "k"];
      names.forEach((name, j) => {
        const p = ours.parameters.find((q) => q.name === name)!;
        const tol = name === "k" ? 1e-6 : 1e-5;
        expect(Math.abs(p.value! - s.params[j]!) / Math.abs(s.params[j]!), `${name}`).toBeLessThan(tol);
        expect(Math.abs(p.se! - s.se[j]!) / s.se[j]!, `SE ${name}`).toBeLessThan(1e-4);
      });
    });
  });
});
