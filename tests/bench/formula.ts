// Compiling hostile and ordinary formulas: every formula up to 2,000 characters is compiled or refused quickly (goal:
// under 200 ms each). The peer is mathjs's own derivative with its default simplification (what the engine did
// before), run on the short formulas only, with a per-formula cap, since its cost grows exponentially.
import { derivative, parse } from "mathjs";
import { compileFormula, FormulaError } from "@/lib/kinetics/formula";
import { PATHOLOGICAL_FORMULAS } from "../helpers/formulas";

const ORDINARY = ["ainf + (a0 - ainf)*exp(-k*t)", "a*exp(-(k*t)^beta) + c", "c + a1*exp(-k1*t) + a2*exp(-k2*t)", "b1*(b2+t)^(-1/b3)"];

function time(f: () => void): number {
  const t0 = performance.now();
  f();
  return performance.now() - t0;
}

export function benchFormula(): void {
  console.log("\nFormulas: compile or refuse (ms; first call warms mathjs)");
  // Warm-up: mathjs builds its simplification rules on first use.
  const warm = time(() => compileFormula(ORDINARY[0]!));
  console.log(`  first formula of the process (warm-up)        ${warm.toFixed(1).padStart(8)}`);
  let worst = 0;
  for (const f of [...ORDINARY.map((formula) => ({ label: formula, formula })), ...PATHOLOGICAL_FORMULAS]) {
    let outcome = "compiled";
    const ms = time(() => {
      try {
        compileFormula(f.formula);
      } catch (e) {
        if (!(e instanceof FormulaError)) throw e;
        outcome = "refused";
      }
    });
    worst = Math.max(worst, ms);
    console.log(`  ${f.label.slice(0, 44).padEnd(46)} ${ms.toFixed(1).padStart(8)}  ${outcome}  (${f.formula.length} chars)`);
  }
  console.log(`  worst after warm-up: ${worst.toFixed(1)} ms (goal < 200 ms): ${worst < 200 ? "met" : "NOT met"}`);
  // The peer: default derivative (with simplify) on a + t + t … sums of growing length.
  console.log("  peer: mathjs derivative() with its default simplify on a*t + t + … + t");
  for (const k of [10, 14, 18, 20]) {
    const node = parse("a*t" + "+t".repeat(k));
    console.log(`    ${k} terms (${3 + 2 * k} chars) ${time(() => derivative(node, "a")).toFixed(1).padStart(8)} ms`);
  }
}
