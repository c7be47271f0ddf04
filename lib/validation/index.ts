// The built-in validation run (installation and operational qualification of the engine on this machine): the NIST StRD
// problems the engine is tested on, the published examples of CHECKS.md, and seeded generated traces with known
// parameters. Each case: reference value, our value, agreement in correct digits (NIST's LRE), threshold, pass/fail.
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import {
  arrhenius,
  calibrate,
  ENGINE_VERSION,
  eyringFrequency,
  fitKinetics,
  fitLine,
  GAS_R,
  halfLife,
  LN_KB_OVER_H,
  meanKineticTemperature,
} from "@/lib/kinetics";
import { lre, nistData, nistFormulaAsT, nistIndex } from "./nist";

export interface ValidationCase {
  id: string;
  group: "NIST StRD nonlinear" | "NIST StRD linear" | "published" | "generated";
  source: string;
  quantity: string;
  reference: number;
  ours: number | null;
  lre: number | null;
  threshold: string;
  pass: boolean;
}

export interface ValidationReport {
  engine_version: string;
  node: string;
  platform: string;
  started_at: string;
  seconds: number;
  reference_files: Array<{ file: string; sha256: string }>;
  cases: ValidationCase[];
  passed: number;
  failed: number;
  all_passed: boolean;
}

export const DEFAULT_REFERENCE_DIR = path.resolve("fixtures");

/** A published value's own precision: ours passes when it rounds to the published figure (half a unit in its last place). */
function publishedTolerance(v: number): number {
  const [mant, exp] = v.toExponential().split("e") as [string, string];
  const decimals = (mant.split(".")[1] ?? "").length;
  return 0.5 * 10 ** (Number(exp) - decimals) * (1 + 1e-9);
}

function lreCase(id: string, group: ValidationCase["group"], source: string, quantity: string, reference: number, ours: number | null | undefined, min: number): ValidationCase {
  const v = ours ?? null;
  const score = v === null || !Number.isFinite(v) ? null : lre(v, reference);
  return { id, group, source, quantity, reference, ours: v, lre: score, threshold: `LRE ≥ ${min}`, pass: score !== null && score >= min };
}

function publishedCase(id: string, source: string, quantity: string, reference: number, ours: number | null | undefined): ValidationCase {
  const v = ours ?? null;
  const tol = publishedTolerance(reference);
  return {
    id,
    group: "published",
    source,
    quantity,
    reference,
    ours: v,
    lre: v === null ? null : lre(v, reference),
    threshold: `rounds to the published ${reference} (±${tol.toPrecision(2)})`,
    pass: v !== null && Math.abs(v - reference) <= tol,
  };
}

export function runValidation(opts: { referenceDir?: string; onProgress?: (done: number, total: number, id: string) => void } = {}): ValidationReport {
  const t0 = performance.now();
  const started = new Date().toISOString();
  const dir = opts.referenceDir ?? DEFAULT_REFERENCE_DIR;
  const nistDir = path.join(dir, "nist");
  const index = nistIndex(nistDir);
  const published = JSON.parse(fs.readFileSync(path.join(dir, "validation", "published.json"), "utf8"));
  const tasks: Array<{ id: string; run: () => ValidationCase[] }> = [];
  const NIST_SRC = "NIST StRD (certified values), fixtures/nist";

  for (const [name, d] of Object.entries(index)) {
    if (d.kind !== "nonlinear" || d.nColumns !== 2) continue;
    tasks.push({
      id: `nist-${name}`,
      run: () => {
        const [y, x] = nistData(name, nistDir);
        const start = Object.fromEntries(d.paramNames.map((p, i) => [p, d.start2![i]!]));
        const r = fitKinetics(x!, y!, { formula: nistFormulaAsT(d.formula), start });
        const out: ValidationCase[] = [];
        d.paramNames.forEach((p, i) => {
          const est = r.parameters.find((q) => q.name === p);
          out.push(lreCase(`${name} ${p}`, "NIST StRD nonlinear", `${NIST_SRC}, ${name} from start 2`, `${p}`, d.certified[i]!, est?.value, 7));
          // Lanczos1's residual sum of squares (1.4e-25) is below double precision: its SDs cannot be reproduced.
          if (name !== "Lanczos1") out.push(lreCase(`${name} SD(${p})`, "NIST StRD nonlinear", `${NIST_SRC}, ${name} from start 2`, `SD of ${p}`, d.certifiedSD[i]!, est?.se, 6));
        });
        return out;
      },
    });
  }
  for (const name of ["Norris", "NoInt1", "NoInt2"]) {
    const d = index[name]!;
    tasks.push({
      id: `nist-${name}`,
      run: () => {
        const [y, x] = nistData(name, nistDir);
        const origin = name !== "Norris";
        const f = fitLine(x!, y!, { throughOrigin: origin });
        const pairs: Array<[string, number, number | null]> = origin
          ? [["B1", d.certified[0]!, f.slope], ["SD(B1)", d.certifiedSD[0]!, f.seSlope]]
          : [["B0", d.certified[0]!, f.intercept], ["B1", d.certified[1]!, f.slope], ["SD(B0)", d.certifiedSD[0]!, f.seIntercept], ["SD(B1)", d.certifiedSD[1]!, f.seSlope]];
        return pairs.map(([q, ref, ours]) => lreCase(`${name} ${q}`, "NIST StRD linear", `${NIST_SRC}, ${name}`, q, ref, ours, 12));
      },
    });
  }
  for (const name of ["Misra1a", "BoxBOD"]) {
    const d = index[name]!;
    tasks.push({
      id: `nist-${name}-first-order`,
      run: () => {
        const [y, x] = nistData(name, nistDir);
        const r = fitKinetics(x!, y!, { model: "first-order", fixed: { a0: 0 } });
        const p = (n: string) => r.parameters.find((q) => q.name === n);
        const src = `${NIST_SRC}, ${name} through the first-order model (a0 fixed at 0, automatic starts)`;
        return [
          lreCase(`${name} b1 (ainf)`, "NIST StRD nonlinear", src, "b1", d.certified[0]!, p("ainf")?.value, 6),
          lreCase(`${name} b2 (k)`, "NIST StRD nonlinear", src, "b2", d.certified[1]!, p("k")?.value, 6),
        ];
      },
    });
  }
  tasks.push({
    id: "crystal-violet",
    run: () => {
      const c = published.crystal_violet;
      const r = fitKinetics(c.t_min.map((m: number) => m * 60), c.absorbance, { model: "first-order" });
      const p = (n: string) => r.parameters.find((q) => q.name === n)!;
      const e = c.expected;
      return [
        publishedCase("CV a0", c.source, "A0", e.a0, p("a0").value),
        publishedCase("CV SE(a0)", c.source, "SE(A0)", e.a0_se, p("a0").se),
        publishedCase("CV ainf", c.source, "A∞", e.ainf, p("ainf").value),
        publishedCase("CV SE(ainf)", c.source, "SE(A∞)", e.ainf_se, p("ainf").se),
        publishedCase("CV k", c.source, "k (min⁻¹)", e.k_per_min, p("k").value! * 60),
        publishedCase("CV SE(k)", c.source, "SE(k) (min⁻¹)", e.k_se_per_min, p("k").se! * 60),
        publishedCase("CV SSR", c.source, "SSR", e.ssr, r.ssr),
        publishedCase("CV t½", c.source, "t½ (min)", e.half_life_min, halfLife(p("k").value!).value / 60),
      ];
    },
  });
  tasks.push({
    id: "n2o5",
    run: () => {
      const n = published.n2o5;
      const a = arrhenius(n.temperature_k.map((T: number, i: number) => ({ temperatureK: T, k: n.k_per_s[i] })));
      return [
        publishedCase("N2O5 Ea", n.source, "Ea (kJ/mol)", n.expected.ea_kj_mol, a.ea.value / 1000),
        publishedCase("N2O5 SE(Ea)", n.source, "SE(Ea) (kJ/mol)", n.expected.ea_se_kj_mol, a.ea.se! / 1000),
        publishedCase("N2O5 A", n.source, "A (1/s)", n.expected.a_per_s, Math.exp(a.lnA.value)),
      ];
    },
  });
  tasks.push({
    id: "calibration",
    run: () => {
      const c = published.calibration;
      const cal = calibrate(c.concentration, c.signal, { sigma: "residual" });
      const e = c.expected;
      return [
        publishedCase("calibration slope", c.source, "slope", e.slope, cal.slope),
        publishedCase("calibration SE(slope)", c.source, "SE(slope)", e.slope_se, cal.seSlope),
        publishedCase("calibration intercept", c.source, "intercept", e.intercept, cal.intercept),
        publishedCase("calibration SE(intercept)", c.source, "SE(intercept)", e.intercept_se, cal.seIntercept),
        publishedCase("calibration residual SD", c.source, "residual SD", e.residual_sd, cal.residualSd),
        publishedCase("calibration LOD", c.source, "LOD", e.lod, cal.lod),
        publishedCase("calibration LOQ", c.source, "LOQ", e.loq, cal.loq),
      ];
    },
  });
  tasks.push({
    id: "constants",
    run: () => {
      const c = published.constants;
      return [
        publishedCase("R", c.source, "R (J/(mol K))", c.expected.R, GAS_R),
        publishedCase("ln(kB/h)", c.source, "ln(kB/h)", c.expected.ln_kB_over_h, LN_KB_OVER_H),
        publishedCase("kB·T/h at 298.15 K", c.source, "kB T/h (1/s)", c.expected.kBT_over_h_298_15, eyringFrequency(298.15)),
      ];
    },
  });
  tasks.push({
    id: "mkt",
    run: () => {
      const m = published.mean_kinetic_temperature;
      const v = meanKineticTemperature(m.temperatures_c.map((c: number) => ({ temperatureK: c + 273.15, duration: 1 }))) - 273.15;
      return [publishedCase("MKT", m.source, "MKT (°C)", m.expected.mkt_c, v)];
    },
  });
  // Generated traces with known parameters (seeded, noiseless): the engine must give them back.
  const GEN_SRC = "generated first-order traces with known parameters (no noise)";
  [
    [1.05, 0.06, 2.5e-3],
    [0.12, 0.9, 8e-4],
    [2.0, 0.3, 0.15],
    [0.8, 0.02, 1.2e-5],
  ].forEach(([a0, ainf, k], i) => {
    tasks.push({
      id: `generated-${i + 1}`,
      run: () => {
        const span = (5 * Math.LN2) / k!;
        const t = Array.from({ length: 80 }, (_, j) => (span * j) / 79);
        const y = t.map((tj) => ainf! + (a0! - ainf!) * Math.exp(-k! * tj));
        const r = fitKinetics(t, y, { model: "first-order" });
        return [lreCase(`trace ${i + 1} k`, "generated", GEN_SRC, "k", k!, r.parameters.find((p) => p.name === "k")?.value, 9)];
      },
    });
  });

  const cases: ValidationCase[] = [];
  // The count is known before the first problem runs: the page shows "0 of N" at once, then each one done.
  opts.onProgress?.(0, tasks.length, tasks[0]?.id ?? "");
  tasks.forEach((task, i) => {
    try {
      cases.push(...task.run());
    } catch (e) {
      // A case that cannot run (a missing or unreadable reference file) fails, saying why.
      cases.push({ id: task.id, group: "published", source: `could not run: ${(e as Error).message}`, quantity: "the case ran", reference: 1, ours: null, lre: null, threshold: "runs", pass: false });
    }
    opts.onProgress?.(i + 1, tasks.length, task.id);
  });
  const files = [...fs.readdirSync(nistDir).filter((f) => f.endsWith(".dat") || f === "index.json").map((f) => path.join(nistDir, f)), path.join(dir, "validation", "published.json")];
  const passed = cases.filter((c) => c.pass).length;
  return {
    engine_version: ENGINE_VERSION,
    node: process.version,
    platform: `${os.platform()} ${os.arch()} (${os.cpus()[0]?.model ?? "cpu"})`,
    started_at: started,
    seconds: (performance.now() - t0) / 1000,
    reference_files: files.sort().map((f) => ({ file: path.relative(dir, f), sha256: createHash("sha256").update(fs.readFileSync(f)).digest("hex") })),
    cases,
    passed,
    failed: cases.length - passed,
    all_passed: passed === cases.length,
  };
}
