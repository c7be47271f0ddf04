// Global least squares over several runs: one residual vector for all points, some parameters shared by every run and
// the rest each run's own, fitted by the engine's Levenberg–Marquardt. The Jacobian is block-structured: a run's own
// parameters touch only its rows (written once per evaluation, the rest stays zero). Standard errors come from
// s²(JᵀJ)⁻¹ over all points together (s² = SSR/dof), as for single fits.
//
// Arrhenius form: k(T) = kref·exp(−(Ea/R)(1/T − 1/Tref)), Tref near the middle of the temperatures so that Ea and kref
// are nearly uncorrelated; each run keeps its own a0 and A∞.
// Shared form: listed parameters (k for replicate runs, say) take one value for all runs.
// Excess form (pseudo-first order): each run's k_obs = k2·[B]0 with [B]0 from the run's metadata; k2 shared, each run's
// a0 and A∞ its own.
import { GAS_R } from "./constants";
import { runsTest } from "./diagnostics";
import { levenbergMarquardt, type LsqProblem } from "./lm";
import { MODELS } from "./models";
import type { NonlinearModel } from "./models/types";
import { FIT_TIME_BUDGET_MS } from "./nls";
import { tQuantile } from "./stats";

export interface GlobalRun {
  label: string;
  t: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Kelvin; needed by the Arrhenius form. */
  temperatureK?: number | null;
  /** mol/L of the reagent in excess; needed by the excess form. */
  excessMolL?: number | null;
  /** A weight for every point of the run (1 when not given). */
  weight?: number;
}

export type GlobalForm = { kind: "arrhenius"; trefK?: number } | { kind: "shared"; shared: readonly string[] } | { kind: "excess" };

export interface GlobalEstimate {
  name: string;
  value: number | null;
  se: number | null;
  ci95: [number, number] | null;
}

export interface GlobalRunResult {
  label: string;
  temperature_k: number | null;
  n: number;
  parameters: Array<{ name: string; value: number | null; se: number | null }>;
  k: { value: number | null; se: number | null };
  ssr: number | null;
  /** The run's share of the total SSR beside its share of the points. */
  ssr_share: number | null;
  runs_z: number | null;
  residuals: Float64Array;
  fitted: Float64Array;
}

export interface GlobalFitResult {
  model: string;
  form: GlobalForm["kind"];
  shared: string[];
  tref_k: number | null;
  n: number;
  dof: number;
  ssr: number | null;
  parameters: GlobalEstimate[];
  runs: GlobalRunResult[];
  /** Correlation of the shared parameters (names in `shared`). */
  correlation: number[][] | null;
  converged: boolean;
  iterations: number;
  message: string;
  warnings: string[];
}

export class GlobalFitError extends Error {
  override name = "GlobalFitError";
}

const RUNS_Z_WARNING = 3;
/** A run whose mean squared residual is this many times the other runs' does not follow the shared law as they do. */
const SSR_RATIO_WARNING = 4;

function nonlinearModel(id: string): NonlinearModel {
  const fn = MODELS.find((m) => m.id === id)?.fn;
  if (!fn) throw new GlobalFitError(`A global fit needs one of the nonlinear models; "${id}" is not one.`);
  return fn;
}

/**
 * k at T (kelvin) in the Arrhenius form k = kref·exp(−(Ea/R)(1/T − 1/Tref)), with its derivatives with respect to Ea
 * and kref (for the Jacobian and the delta method).
 */
export function arrheniusFormRate(ea: number, kref: number, temperatureK: number, trefK: number): { k: number; dEa: number; dKref: number } {
  const u = 1 / temperatureK - 1 / trefK;
  const e = Math.exp((-ea / GAS_R) * u);
  const k = kref * e;
  return { k, dEa: (-k * u) / GAS_R, dKref: e };
}

/** Fits every run together. Throws GlobalFitError for a specification the data cannot carry (named plainly). */
export function fitGlobal(modelId: string, runsIn: readonly GlobalRun[], form: GlobalForm, opts: { deadline?: number } = {}): GlobalFitResult {
  const fn = nonlinearModel(modelId);
  const mp = fn.params;
  if (runsIn.length < 2) throw new GlobalFitError("A global fit needs at least two runs.");
  const runs = runsIn.map((r) => ({ ...r, t: Float64Array.from(r.t), y: Float64Array.from(r.y), w: r.weight ?? 1 }));
  for (const r of runs) {
    if (r.t.length < mp.length) throw new GlobalFitError(`${r.label}: ${r.t.length} points cannot carry ${mp.length} parameters.`);
    if (!(r.w > 0) || !Number.isFinite(r.w)) throw new GlobalFitError(`${r.label}: a run's weight must be a positive number.`);
  }

  let sharedNames: string[];
  let trefK: number | null = null;
  // Forms in which k is not a parameter but follows from the shared ones (Arrhenius, excess).
  const derivedK = form.kind === "arrhenius" || form.kind === "excess";
  if (form.kind === "excess") {
    if (!mp.includes("k")) throw new GlobalFitError(`The excess form needs a model with a rate constant k; ${modelId} has ${mp.join(", ")}.`);
    for (const r of runs)
      if (!(typeof r.excessMolL === "number" && r.excessMolL > 0)) throw new GlobalFitError(`${r.label}: no concentration of the reagent in excess; the excess form needs each run's [B]0.`);
    const bs = runs.map((r) => r.excessMolL!);
    if (Math.max(...bs) / Math.min(...bs) < 1.0001) throw new GlobalFitError("The runs share one excess concentration: k2 needs at least two concentrations.");
    sharedNames = ["k2"];
  } else if (form.kind === "arrhenius") {
    if (!mp.includes("k")) throw new GlobalFitError(`The Arrhenius form needs a model with a rate constant k; ${modelId} has ${mp.join(", ")}.`);
    for (const r of runs)
      if (!(typeof r.temperatureK === "number" && r.temperatureK > 0)) throw new GlobalFitError(`${r.label}: no temperature; the Arrhenius form needs each run's temperature.`);
    const temps = runs.map((r) => r.temperatureK!);
    if (Math.max(...temps) - Math.min(...temps) < 0.05) throw new GlobalFitError("The runs share one temperature: an activation energy needs at least two temperatures.");
    trefK = form.trefK ?? temps.reduce((a, b) => a + b, 0) / temps.length;
    sharedNames = ["ea", "kref"];
  } else {
    const unknown = form.shared.filter((s) => !mp.includes(s));
    if (unknown.length) throw new GlobalFitError(`${unknown.join(", ")} ${unknown.length > 1 ? "are not parameters" : "is not a parameter"} of ${modelId} (its parameters: ${mp.join(", ")}).`);
    if (form.shared.length === 0) throw new GlobalFitError("Name at least one parameter to share.");
    sharedNames = [...new Set(form.shared)];
  }
  const own = derivedK ? mp.filter((p) => p !== "k") : mp.filter((p) => !sharedNames.includes(p));
  const S = sharedNames.length;
  const P = S + runs.length * own.length;
  const N = runs.reduce((s, r) => s + r.t.length, 0);
  if (N <= P) throw new GlobalFitError(`${N} points cannot carry ${P} parameters.`);
  const offsets: number[] = [];
  {
    let o = 0;
    for (const r of runs) {
      offsets.push(o);
      o += r.t.length;
    }
  }
  const col = (run: number, name: string): number => {
    const s = sharedNames.indexOf(name);
    if (s >= 0) return s;
    return S + run * own.length + own.indexOf(name);
  };

  // Start values: each run's own start rule (a grid search on k, the amplitudes by linear least squares), refined by
  // a fit of the run alone only where the rule gives nothing; shared values from those (Arrhenius: ln k on 1/T).
  const alone = runs.map((r) => {
    const t0 = r.t[0]!;
    const s = fn.starts(r.t.map((x) => x - t0), r.y, {})[0];
    const v: Record<string, number> = {};
    if (s && mp.every((p) => Number.isFinite(s[p]))) {
      const moved = fn.toOrigin ? fn.toOrigin(s, t0).values : s;
      for (const p of mp) v[p] = moved[p] ?? s[p]!;
    }
    if (!mp.every((p) => Number.isFinite(v[p]))) {
      const res = MODELS.find((m) => m.id === modelId)!.fit(r.t, r.y, {});
      for (const p of res.parameters) if (p.value !== null && Number.isFinite(p.value)) v[p.name] = p.value;
    }
    if (!mp.every((p) => Number.isFinite(v[p]))) throw new GlobalFitError(`${r.label}: no start values could be found for ${modelId}; check the run alone first.`);
    return v;
  });
  const x0 = new Float64Array(P);
  if (form.kind === "arrhenius") {
    const xs = runs.map((r) => 1 / r.temperatureK! - 1 / trefK!);
    const ys = alone.map((v) => Math.log(Math.max(v.k!, 1e-300)));
    const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
    const my = ys.reduce((a, b) => a + b, 0) / ys.length;
    let sxy = 0,
      sxx = 0;
    xs.forEach((x, i) => {
      sxy += (x - mx) * (ys[i]! - my);
      sxx += (x - mx) ** 2;
    });
    const slope = sxx > 0 ? sxy / sxx : 0;
    x0[0] = -slope * GAS_R;
    x0[1] = Math.exp(my - slope * mx);
  } else if (form.kind === "excess") {
    // k_obs on [B]0 through the origin.
    let sxy = 0,
      sxx = 0;
    runs.forEach((r, i) => {
      sxy += r.excessMolL! * alone[i]!.k!;
      sxx += r.excessMolL! ** 2;
    });
    x0[0] = Math.max(sxy / sxx, 1e-300);
  } else {
    sharedNames.forEach((s, j) => (x0[j] = alone.reduce((a, v) => a + v[s]!, 0) / alone.length));
  }
  runs.forEach((_, i) => own.forEach((p) => (x0[col(i, p)] = alone[i]![p]!)));

  const lower = new Array<number>(P).fill(-Infinity);
  if (form.kind === "arrhenius") lower[1] = 0;
  if (form.kind === "excess") lower[0] = 0;
  runs.forEach((_, i) => mp.forEach((p) => {
    if (fn.lower[p] !== undefined && !(derivedK && p === "k")) lower[col(i, p)] = fn.lower[p]!;
  }));

  // The run's model parameters from the global vector, and (where k follows from the shared parameters) k's
  // derivatives with respect to each shared parameter: Arrhenius (Ea, kref), excess (k2).
  const runParams = (x: Float64Array, i: number, out: Float64Array): number[] | null => {
    mp.forEach((p, j) => {
      if (derivedK && p === "k") return;
      out[j] = x[col(i, p)]!;
    });
    if (form.kind === "excess") {
      out[mp.indexOf("k")] = x[0]! * runs[i]!.excessMolL!;
      return [runs[i]!.excessMolL!];
    }
    if (form.kind !== "arrhenius") return null;
    const a = arrheniusFormRate(x[0]!, x[1]!, runs[i]!.temperatureK!, trefK!);
    out[mp.indexOf("k")] = a.k;
    return [a.dEa, a.dKref];
  };

  const pBuf = new Float64Array(mp.length);
  const fitted = runs.map((r) => new Float64Array(r.t.length));
  const local = runs.map((r) => new Float64Array(r.t.length * mp.length));
  // Shared columns reach every row; a run's own columns only its rows.
  const support: Array<[number, number]> = Array.from({ length: P }, (_, j) => {
    if (j < S) return [0, N];
    const run = Math.floor((j - S) / own.length);
    return [offsets[run]!, offsets[run]! + runs[run]!.t.length];
  });
  const problem: LsqProblem = {
    n: N,
    p: P,
    support,
    residuals(x, out) {
      runs.forEach((r, i) => {
        runParams(x, i, pBuf);
        fn.evaluate(r.t, pBuf, fitted[i]!);
        const sw = Math.sqrt(r.w);
        const o = offsets[i]!;
        for (let q = 0; q < r.t.length; q++) out[o + q] = sw * (fitted[i]![q]! - r.y[q]!);
      });
    },
    jacobian(x, J) {
      J.fill(0);
      runs.forEach((r, i) => {
        const d = runParams(x, i, pBuf);
        const n = r.t.length;
        const Jl = local[i]!;
        fn.jacobian(r.t, pBuf, Jl);
        const sw = Math.sqrt(r.w);
        const o = offsets[i]!;
        mp.forEach((p, j) => {
          const src = j * n;
          if (derivedK && p === "k") {
            for (let q = 0; q < n; q++) {
              const g = sw * Jl[src + q]!;
              for (let c = 0; c < d!.length; c++) J[c * N + o + q] = g * d![c]!;
            }
            return;
          }
          const c = col(i, p);
          for (let q = 0; q < n; q++) J[c * N + o + q] = J[c * N + o + q]! + sw * Jl[src + q]!;
        });
      });
    },
  };

  // Normal equations for the steps (the engine falls back to QR when they are ill-conditioned); covariance from QR.
  const lm = levenbergMarquardt(problem, x0, { lower, solver: "normal-equations", deadline: opts.deadline ?? Date.now() + FIT_TIME_BUDGET_MS });
  const dof = N - P;
  const base = { model: modelId, form: form.kind, shared: sharedNames, tref_k: trefK, n: N, dof };
  if (!lm.converged || !Number.isFinite(lm.ssr)) {
    const why = lm.stop === "time-budget" ? `it ran past its time limit of ${FIT_TIME_BUDGET_MS / 1000} s` : lm.stop === "not-finite" ? "the model gave values that are not numbers" : `it stopped without converging (${lm.stop})`;
    return {
      ...base,
      ssr: null,
      parameters: sharedNames.map((name) => ({ name, value: null, se: null, ci95: null })),
      runs: runs.map((r) => ({ label: r.label, temperature_k: r.temperatureK ?? null, n: r.t.length, parameters: own.map((name) => ({ name, value: null, se: null })), k: { value: null, se: null }, ssr: null, ssr_share: null, runs_z: null, residuals: new Float64Array(0), fitted: new Float64Array(0) })),
      correlation: null,
      converged: false,
      iterations: lm.iterations,
      message: `The global fit did not converge: ${why}. Check each run's own fit first.`,
      warnings: [],
    };
  }

  const x = lm.x;
  const s2 = lm.ssr / dof;
  // Covariance over all P parameters (a parameter held on a bound has no SE).
  const pf = lm.freeIndex.length;
  const cov = (a: number, b: number): number | null => {
    if (!lm.inverseHessian) return null;
    const ia = lm.freeIndex.indexOf(a),
      ib = lm.freeIndex.indexOf(b);
    if (ia < 0 || ib < 0 || lm.atBound.includes(a) || lm.atBound.includes(b)) return null;
    return s2 * lm.inverseHessian[ia * pf + ib]!;
  };
  const se = (j: number): number | null => {
    const v = cov(j, j);
    return v !== null && v >= 0 ? Math.sqrt(v) : null;
  };
  const tq = tQuantile(0.975, dof);
  const parameters: GlobalEstimate[] = sharedNames.map((name, j) => {
    const s = se(j);
    return { name, value: x[j]!, se: s, ci95: s === null ? null : [x[j]! - tq * s, x[j]! + tq * s] };
  });
  const correlation = sharedNames.map((_, a) =>
    sharedNames.map((__, b) => {
      const c = cov(a, b),
        va = cov(a, a),
        vb = cov(b, b);
      return c === null || va === null || vb === null || va <= 0 || vb <= 0 ? NaN : c / Math.sqrt(va * vb);
    }),
  );

  // Per run: its fitted curve and residuals at the solution, its parameters, its k (with the delta method in the
  // Arrhenius form), its share of the SSR and its runs test.
  problem.residuals(x, new Float64Array(N));
  const warnings: string[] = [];
  const runResults: GlobalRunResult[] = runs.map((r, i) => {
    const d = runParams(x, i, pBuf);
    const residuals = new Float64Array(r.t.length);
    let ssr = 0;
    for (let q = 0; q < r.t.length; q++) {
      residuals[q] = r.y[q]! - fitted[i]![q]!;
      ssr += r.w * residuals[q]! ** 2;
    }
    let k: { value: number | null; se: number | null };
    if (derivedK) {
      // The delta method over the shared parameters: var k = gᵀ C g.
      let v: number | null = 0;
      for (let a = 0; a < d!.length && v !== null; a++)
        for (let b = 0; b < d!.length; b++) {
          const c = cov(a, b);
          if (c === null) {
            v = null;
            break;
          }
          v += d![a]! * d![b]! * c;
        }
      k = { value: pBuf[mp.indexOf("k")]!, se: v !== null && v >= 0 ? Math.sqrt(v) : null };
    } else {
      const kc = mp.includes("k") ? col(i, "k") : -1;
      k = kc >= 0 ? { value: x[kc]!, se: se(kc) } : { value: null, se: null };
    }
    const rt = runsTest(residuals);
    return {
      label: r.label,
      temperature_k: r.temperatureK ?? null,
      n: r.t.length,
      parameters: own.map((name) => ({ name, value: x[col(i, name)]!, se: se(col(i, name)) })),
      k,
      ssr,
      ssr_share: lm.ssr > 0 ? ssr / lm.ssr : null,
      runs_z: rt.z,
      residuals,
      fitted: Float64Array.from(fitted[i]!),
    };
  });
  // A run far off the shared law is named by its share of the SSR (it also pulls the others, whose residuals then run
  // in stretches too); only when no run stands out so, runs tests name the runs that curve away from the law.
  // Each run's mean square against the pooled mean square of the other runs (an F-like ratio).
  const ratios = runResults.map((r) => {
    const rest = (lm.ssr - r.ssr!) / (N - r.n);
    return rest > 0 ? r.ssr! / r.n / rest : 1;
  });
  const outliers = runResults.filter((_, i) => ratios[i]! > SSR_RATIO_WARNING);
  for (const r of outliers)
    warnings.push(`${r.label}: its residuals are ${ratios[runResults.indexOf(r)]!.toFixed(1)} times the mean square of the other runs: this run does not follow the shared law as the others do (the others' residuals may show its pull). Check it alone.`);
  if (!outliers.length)
    for (const r of runResults)
      if (r.runs_z !== null && Math.abs(r.runs_z) > RUNS_Z_WARNING)
        warnings.push(`${r.label}: its residuals run in long stretches of one sign (runs test z = ${r.runs_z.toFixed(1)}): this run does not follow the shared law as the fit assumes.`);
  if (form.kind === "arrhenius") {
    const r01 = correlation[0]![1]!;
    if (Math.abs(r01) > 0.95) warnings.push(`Ea and kref are strongly correlated (r = ${r01.toFixed(3)}); choose Tref nearer the middle of the temperatures.`);
  }
  return { ...base, ssr: lm.ssr, parameters, runs: runResults, correlation, converged: true, iterations: lm.iterations, message: `Converged after ${lm.iterations} iterations.`, warnings };
}
