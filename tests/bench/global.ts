// Global fit benchmark: 10 runs × 10,000 points (first order, Arrhenius form), our engine in-process beside
// scipy.optimize.least_squares (lm and trf, analytic Jacobian) on the same problem in the same run. Ours includes its
// start values (each run fitted alone first); scipy is handed starts 10–15 % off the truth. Medians and ratios.
import { spawnSync } from "node:child_process";
import { celsiusToKelvin, fitGlobal, GAS_R } from "@/lib/kinetics";
import { DEBIAN_PYTHON } from "../helpers/python";
import { seededRandom } from "../helpers/random";

const RUNS = 10;
const POINTS = 10_000;
const median = (a: number[]) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)]!;

export function benchGlobal(): void {
  const ea = 82_000,
    kref = 2e-3,
    tref = celsiusToKelvin(40);
  const runs = Array.from({ length: RUNS }, (_, i) => {
    const rnd = seededRandom(500 + i);
    const T = celsiusToKelvin(20 + 5 * i);
    const k = kref * Math.exp((-ea / GAS_R) * (1 / T - 1 / tref));
    const t = Array.from({ length: POINTS }, (_, q) => (q * 4) / k / (POINTS - 1));
    const a0 = 0.95 + 0.01 * i,
      ainf = 0.05;
    return { label: `run ${i + 1}`, t, y: t.map((x) => ainf + (a0 - ainf) * Math.exp(-k * x) + 0.004 * rnd.normal()), temperatureK: T };
  });
  const tr = celsiusToKelvin(20 + 2.5 * (RUNS - 1));
  const times: number[] = [];
  let ours = fitGlobal("first-order", runs, { kind: "arrhenius", trefK: tr });
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    ours = fitGlobal("first-order", runs, { kind: "arrhenius", trefK: tr });
    times.push(performance.now() - t0);
  }
  const spec = { form: "arrhenius", tref: tr, runs: runs.map((r) => ({ t: r.t, y: r.y, T: r.temperatureK })), x0: [ea * 1.15, kref * Math.exp((-ea / GAS_R) * (1 / tr - 1 / tref)) * 0.85, ...runs.flatMap((r) => [r.y[0]! * 1.1, 0.05 * 0.9])] };
  const peer = spawnSync(DEBIAN_PYTHON, ["tests/bench/scipy_global_bench.py"], { input: JSON.stringify({ spec, repeats: 3 }), encoding: "utf8", maxBuffer: 512 * 1024 * 1024 });
  console.log(`\nGlobal fit: ${RUNS} runs × ${POINTS.toLocaleString("en")} points, first order, Arrhenius form (22 parameters)`);
  const ms = median(times);
  console.log(`  ours (fitGlobal, starts included)      ${ms.toFixed(0).padStart(6)} ms   Ea ${ours.parameters[0]!.value!.toFixed(1)} J/mol, ${ours.iterations} iterations`);
  if (peer.status !== 0) {
    console.log(`  scipy peer could not run: ${peer.stderr || peer.error?.message}`);
    return;
  }
  const p = JSON.parse(peer.stdout) as { lm: number; trf: number; lm_ea: number; trf_ea: number };
  console.log(`  scipy least_squares lm (MINPACK)       ${(p.lm * 1000).toFixed(0).padStart(6)} ms   Ea ${p.lm_ea.toFixed(1)} J/mol   ours/peer ${(ms / (p.lm * 1000)).toFixed(2)}`);
  console.log(`  scipy least_squares trf                ${(p.trf * 1000).toFixed(0).padStart(6)} ms   Ea ${p.trf_ea.toFixed(1)} J/mol   ours/peer ${(ms / (p.trf * 1000)).toFixed(2)}`);
}
