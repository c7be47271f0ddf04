// Global fits checked against scipy.optimize.least_squares (Debian's python3-scipy, tests/reference/scipy_global.py:
// MINPACK LM, analytic Jacobian, tolerances 1e-15) on generated data: every value to 6 significant figures and every
// standard error to 3, through `cli global` as outside checks run it. The data are generated here (first-order decays
// with Gaussian noise, seeded), not measured.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "@/lib/cli/main";
import { arrhenius, celsiusToKelvin, fitGlobal, fitKinetics, GAS_R } from "@/lib/kinetics";
import { runPython } from "../../helpers/python";
import { seededRandom } from "../../helpers/random";

const EA = 85_000;
const TREF = celsiusToKelvin(40);
const KREF = 2.0e-3;
const TEMPS_C = [25, 35, 45, 55];

interface Generated {
  file: string;
  tc: number;
  t: number[];
  y: number[];
}
let dir: string;
const arrheniusRuns: Generated[] = [];
const replicateRuns: Generated[] = [];

function makeRun(name: string, tc: number, k: number, n: number, seed: number, withTemperature = true): Generated {
  const rnd = seededRandom(seed);
  const a0 = 0.9 + 0.02 * (seed % 5);
  const ainf = 0.04 + 0.005 * (seed % 3);
  const span = 3.5 / k;
  const t = Array.from({ length: n }, (_, i) => Math.round(((i * span) / (n - 1)) * 1000) / 1000);
  const y = t.map((ti) => ainf + (a0 - ainf) * Math.exp(-k * ti) + 0.003 * rnd.normal());
  const file = path.join(dir, name);
  const lines = [...(withTemperature ? [`Temperature: ${tc} °C`] : []), "Time (s),A 590 nm", ...t.map((ti, i) => `${ti},${y[i]!.toFixed(6)}`)];
  fs.writeFileSync(file, lines.join("\n") + "\n");
  return { file, tc, t, y: y.map((v) => Number(v.toFixed(6))) };
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-global-"));
  TEMPS_C.forEach((tc, i) => {
    const k = KREF * Math.exp((-EA / GAS_R) * (1 / celsiusToKelvin(tc) - 1 / TREF));
    arrheniusRuns.push(makeRun(`run-${tc}C.csv`, tc, k, 60 + 20 * i, 11 + i));
  });
  for (let i = 0; i < 3; i++) replicateRuns.push(makeRun(`rep-${i + 1}.csv`, 30, 1.3e-3, 80 + 15 * i, 31 + i));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

type Out = { shared: string[]; tref_c: number | null; n: number; dof: number; ssr: number; converged: boolean; parameters: Array<{ name: string; value: number; se: number; ci95: [number, number] }>; runs: Array<{ file: string; temperature_c: number; n: number; parameters: Array<{ name: string; value: number; se: number }>; k: { value: number; se: number } }> };
async function cli(args: string[]): Promise<Out> {
  const r = await runCli(["global", ...args, "--json"]);
  expect(r.code, r.err).toBe(0);
  return JSON.parse(r.out!) as Out;
}
const sig = (a: number, b: number, digits: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(0.5 * 10 ** (1 - digits) * Math.abs(b));
function flat(o: Out): { x: number[]; se: number[] } {
  const x = o.parameters.map((p) => p.value),
    se = o.parameters.map((p) => p.se);
  for (const r of o.runs) for (const p of r.parameters) (x.push(p.value), se.push(p.se));
  return { x, se };
}

describe("Arrhenius form (scipy.optimize.least_squares recomputation)", () => {
  it("Ea, kref and every run's a0 and A∞ to 6 significant figures, their SEs to 3; each run's k from the shared law", async () => {
    const out = await cli([...arrheniusRuns.map((r) => r.file), "--model", "first-order", "--arrhenius", "--tref", "40"]);
    expect(out.converged).toBe(true);
    expect(out.shared).toEqual(["ea", "kref"]);
    expect(out.tref_c).toBe(40);
    const ours = flat(out);
    // scipy starts from values 10–20 % off, not from ours.
    const x0 = [EA * 1.15, KREF * 0.85, ...arrheniusRuns.flatMap((r) => [r.y[0]! * 1.1, r.y.at(-1)! * 0.8])];
    const ref = runPython<{ x: number[]; se: number[]; ssr: number; dof: number; status: number }>("tests/reference/scipy_global.py", {
      form: "arrhenius",
      tref: TREF,
      runs: arrheniusRuns.map((r) => ({ t: r.t, y: r.y, T: celsiusToKelvin(r.tc) })),
      x0,
    });
    expect(ref.status).toBeGreaterThan(0);
    expect(out.dof).toBe(ref.dof);
    sig(out.ssr, ref.ssr, 6);
    ref.x.forEach((v, j) => sig(ours.x[j]!, v, 6));
    ref.se.forEach((v, j) => sig(ours.se[j]!, v, 3));
    // The shared law gives each run's k.
    for (const r of out.runs) sig(r.k.value, out.parameters[1]!.value * Math.exp((-out.parameters[0]!.value / GAS_R) * (1 / celsiusToKelvin(r.temperature_c) - 1 / TREF)), 12);
    // Near the truth the data were made from (noise 0.003 AU): Ea within 3 SE.
    expect(Math.abs(out.parameters[0]!.value - EA)).toBeLessThan(3 * out.parameters[0]!.se);
  });

  it("Tref defaults to the mean of the runs' temperatures, printed as tref_c", async () => {
    const out = await cli([...arrheniusRuns.map((r) => r.file), "--model", "first-order", "--arrhenius"]);
    sig(out.tref_c!, 40, 9);
  });

  it("the two-stage route (each run fitted, then Arrhenius on the k's) and the global fit agree within their uncertainties", async () => {
    const out = await cli([...arrheniusRuns.map((r) => r.file), "--model", "first-order", "--arrhenius", "--tref", "40"]);
    const points = arrheniusRuns.map((r) => {
      const f = fitKinetics(r.t, r.y, { model: "first-order" });
      const k = f.parameters.find((p) => p.name === "k")!;
      return { temperatureK: celsiusToKelvin(r.tc), k: k.value!, se: k.se };
    });
    const two = arrhenius(points);
    const g = out.parameters[0]!;
    expect(Math.abs(g.value - two.ea.value)).toBeLessThan(2 * Math.hypot(g.se, two.ea.se ?? 0));
  });

  it("a file without a temperature is refused, naming the file", async () => {
    const bare = makeRun("no-temperature.csv", 25, 1e-3, 40, 5, false);
    const r = await runCli(["global", arrheniusRuns[0]!.file, bare.file, "--model", "first-order", "--arrhenius", "--json"]);
    expect(r.code).toBe(1);
    expect(r.err).toContain("no-temperature.csv: no temperature in the file's metadata");
  });

  it("one temperature for every run is refused: no activation energy without two temperatures", () => {
    expect(() => fitGlobal("first-order", replicateRuns.map((r) => ({ label: r.file, t: r.t, y: r.y, temperatureK: 303.15 })), { kind: "arrhenius" })).toThrow(/at least two temperatures/);
  });
});

describe("shared parameters (scipy.optimize.least_squares recomputation)", () => {
  it("replicate runs sharing k: k and every run's a0 and A∞ to 6 significant figures, SEs to 3", async () => {
    const out = await cli([...replicateRuns.map((r) => r.file), "--model", "first-order", "--shared", "k"]);
    expect(out.shared).toEqual(["k"]);
    expect(out.tref_c).toBeNull();
    const ours = flat(out);
    const x0 = [1.5e-3, ...replicateRuns.flatMap((r) => [r.y[0]! * 1.1, r.y.at(-1)! * 0.8])];
    const ref = runPython<{ x: number[]; se: number[]; ssr: number }>("tests/reference/scipy_global.py", { form: "shared", shared: ["k"], runs: replicateRuns.map((r) => ({ t: r.t, y: r.y })), x0 });
    ref.x.forEach((v, j) => sig(ours.x[j]!, v, 6));
    ref.se.forEach((v, j) => sig(ours.se[j]!, v, 3));
    for (const r of out.runs) expect(r.k.value).toBe(out.parameters[0]!.value);
  });

  it("an unknown parameter name is refused, naming the model's parameters", async () => {
    const r = await runCli(["global", ...replicateRuns.map((x) => x.file), "--model", "first-order", "--shared", "kk", "--json"]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/kk is not a parameter of first-order \(its parameters: a0, ainf, k\)/);
  });
});

describe("pseudo-first-order runs sharing k2 (scipy.optimize.least_squares recomputation)", () => {
  // k_obs = k2·[B]0 at four excess concentrations (generated: k2 = 0.85 L mol⁻¹ s⁻¹).
  const K2 = 0.85;
  const B = [1e-3, 2e-3, 3.5e-3, 5e-3];
  const excessRuns = () => B.map((b, i) => ({ b, ...makeRun(`excess-${i + 1}.csv`, 25, K2 * b, 70 + 10 * i, 51 + i) }));

  it("k2 and every run's a0 and A∞ to 6 significant figures, their SEs to 3; each run's k_obs = k2·[B]0 with its SE", () => {
    const runs = excessRuns();
    const out = fitGlobal("first-order", runs.map((r) => ({ label: path.basename(r.file), t: r.t, y: r.y, excessMolL: r.b })), { kind: "excess" });
    expect(out.converged).toBe(true);
    expect(out.shared).toEqual(["k2"]);
    const x = [out.parameters[0]!.value!, ...out.runs.flatMap((r) => r.parameters.map((p) => p.value!))];
    const se = [out.parameters[0]!.se!, ...out.runs.flatMap((r) => r.parameters.map((p) => p.se!))];
    const x0 = [K2 * 1.2, ...runs.flatMap((r) => [r.y[0]! * 1.1, r.y.at(-1)! * 0.8])];
    const ref = runPython<{ x: number[]; se: number[]; ssr: number }>("tests/reference/scipy_global.py", { form: "excess", runs: runs.map((r) => ({ t: r.t, y: r.y, B: r.b })), x0 });
    ref.x.forEach((v, j) => sig(x[j]!, v, 6));
    ref.se.forEach((v, j) => sig(se[j]!, v, 3));
    sig(out.ssr!, ref.ssr, 6);
    out.runs.forEach((r, i) => {
      expect(r.k.value).toBeCloseTo(out.parameters[0]!.value! * B[i]!, 15);
      sig(r.k.se!, out.parameters[0]!.se! * B[i]!, 6);
    });
    // The generating k2 within 3 SE (generated data, not a reference value).
    expect(Math.abs(out.parameters[0]!.value! - K2)).toBeLessThan(3 * out.parameters[0]!.se!);
  });

  it("a run without its excess concentration, or one concentration for all, is refused with the reason", () => {
    const runs = excessRuns().map((r) => ({ label: path.basename(r.file), t: r.t, y: r.y, excessMolL: r.b as number | null }));
    runs[2]!.excessMolL = null;
    expect(() => fitGlobal("first-order", runs, { kind: "excess" })).toThrow(/excess-3\.csv: no concentration of the reagent in excess/);
    expect(() => fitGlobal("first-order", runs.map((r) => ({ ...r, excessMolL: 2e-3 })), { kind: "excess" })).toThrow(/share one excess concentration/);
  });
});

describe("a run that does not follow the shared law is named", () => {
  it("a run whose k is twice the others' under a shared k gets a warning naming it", () => {
    const odd = makeRun("odd.csv", 30, 2.6e-3, 90, 41);
    const r = fitGlobal("first-order", [...replicateRuns, odd].map((x) => ({ label: path.basename(x.file), t: x.t, y: x.y })), { kind: "shared", shared: ["k"] });
    expect(r.converged).toBe(true);
    expect(r.warnings.join(" ")).toMatch(/odd\.csv: .*does not follow the shared law/);
    expect(r.warnings.join(" ")).not.toMatch(/rep-1/);
  });
});
