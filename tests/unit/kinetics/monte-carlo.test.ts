// Monte-Carlo check of the reported standard error (common practice for validating an uncertainty): over many noisy
// replicates of one first-order trace, the mean reported SE(k) should match the scatter of the fitted k.
import { describe, expect, it } from "vitest";
import { fitKinetics } from "@/lib/kinetics";
import { seededRandom } from "../../helpers/random";

const REPLICATES = 5000;

describe(`reported SE(k) against the scatter of k over ${REPLICATES} seeded replicates`, () => {
  for (const [label, halfLives, noise] of [
    ["3 half-lives, 1 % noise", 3, 0.01],
    ["1.5 half-lives, 3 % noise", 1.5, 0.03],
  ] as const) {
    it(`${label}: within 5 %`, () => {
      const rnd = seededRandom(20261202);
      const k = 2.5e-3,
        a0 = 1.1,
        ainf = 0.08,
        n = 60;
      const span = (halfLives * Math.LN2) / k;
      const t = Array.from({ length: n }, (_, i) => (span * i) / (n - 1));
      const ks: number[] = [],
        ses: number[] = [];
      for (let r = 0; r < REPLICATES; r++) {
        const y = t.map((ti) => ainf + (a0 - ainf) * Math.exp(-k * ti) + noise * rnd.normal());
        const fit = fitKinetics(t, y, { model: "first-order" });
        expect(fit.converged).toBe(true);
        const p = fit.parameters.find((q) => q.name === "k")!;
        ks.push(p.value!);
        ses.push(p.se!);
      }
      const mean = ks.reduce((s, v) => s + v, 0) / ks.length;
      const sd = Math.sqrt(ks.reduce((s, v) => s + (v - mean) ** 2, 0) / (ks.length - 1));
      const meanSe = ses.reduce((s, v) => s + v, 0) / ses.length;
      console.log(`${label}: SD of k ${sd.toExponential(4)}, mean SE ${meanSe.toExponential(4)}, ratio ${(meanSe / sd).toFixed(4)}`);
      expect(Math.abs(meanSe / sd - 1)).toBeLessThan(0.05);
    });
  }
});
