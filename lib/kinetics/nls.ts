// A nonlinear fit with its health: runs LM (several starts when the first fails), then derives SEs, 95 % CIs,
// correlations, diagnostics and a plain-words message. Every model, built-in or user formula, goes through here.
import { aicc, durbinWatson, runsTest } from "./diagnostics";
import { levenbergMarquardt, type LmResult } from "./lm";
import { fsum, tQuantile } from "./stats";
import type { FitResult, ModelFunction, ParameterEstimate, Weighting } from "./types";

export interface NlsOptions {
  /** Start values by name; missing ones default to 1. */
  start: Record<string, number>;
  /** Alternative starts tried in order when the first does not converge. */
  alternativeStarts?: Array<Record<string, number>>;
  fixed?: Record<string, number>;
  lower?: Record<string, number>;
  upper?: Record<string, number>;
  weighting?: Weighting;
  maxIterations?: number;
  /** See LmOptions.solver; built-in models on long series use the normal equations (with a QR fallback). */
  solver?: "qr" | "normal-equations";
  /** Wall-clock budget for all starts together; past it the fit stops unconverged and says so. */
  timeBudgetMs?: number;
  /** Added to times when points are named in warnings (fits run in times counted from the first reading). */
  timeOrigin?: number;
}

/** |r| at or above this: the two parameters cannot be told apart by the data. */
export const INDISTINGUISHABLE = 0.99;

/** Every fit has a time limit (a hostile formula or a huge series cannot hold the thread indefinitely). */
export const FIT_TIME_BUDGET_MS = 20_000;

export const CORRELATION_WARNING = 0.95;

/** The engine never changes its inputs, so a Float64Array is used as it is (no 8 MB copy per million points). */
export function asFloat64(a: ArrayLike<number>): Float64Array {
  return a instanceof Float64Array ? a : Float64Array.from(a);
}

function weightsOf(w: Weighting, n: number): Float64Array | null {
  if (w.kind === "none") return null;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = w.kind === "relative" ? w.weights[i]! : 1 / w.sigma[i]! ** 2;
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`weight ${i + 1} is not a finite non-negative number`);
    out[i] = v;
  }
  return out;
}

export function checkData(t: ArrayLike<number>, y: ArrayLike<number>, nParams: number): string | null {
  if (t.length !== y.length) return `time and value arrays differ in length (${t.length} and ${y.length}).`;
  for (let i = 0; i < t.length; i++) {
    if (!Number.isFinite(t[i]!)) return `time at point ${i + 1} is not a finite number.`;
    if (!Number.isFinite(y[i]!)) return `the value at point ${i + 1} is not a finite number.`;
  }
  if (t.length <= nParams)
    return `${t.length} point${t.length === 1 ? "" : "s"} cannot determine ${nParams} free parameter${nParams === 1 ? "" : "s"} with an uncertainty: at least ${nParams + 1} are needed.`;
  let allEqual = true;
  for (let i = 1; i < y.length; i++) if (y[i] !== y[0]) allEqual = false;
  if (allEqual && y.length > 0) return "all values are equal: there is no change to fit.";
  return null;
}

export function failedFit(modelName: string, params: readonly string[], n: number, message: string, fixed: Record<string, number> = {}): FitResult {
  return {
    model: modelName,
    n,
    parameters: params.map((name) => ({
      name,
      value: name in fixed ? fixed[name]! : null,
      se: null,
      ci95: null,
      fixed: name in fixed,
    })),
    ssr: null,
    dof: Math.max(0, n - params.filter((p) => !(p in fixed)).length),
    r2: null,
    rmse: null,
    aicc: null,
    runs: null,
    runs_z: null,
    runs_p: null,
    durbin_watson: null,
    converged: false,
    iterations: 0,
    message,
    correlation: null,
    correlation_names: [],
    warnings: [],
    weighting: "none",
    residuals: new Float64Array(0),
    fitted: new Float64Array(0),
  };
}

export function fitNonlinear(modelName: string, model: ModelFunction, tIn: ArrayLike<number>, yIn: ArrayLike<number>, opts: NlsOptions): FitResult {
  const t = asFloat64(tIn);
  const y = asFloat64(yIn);
  const n = t.length;
  const P = model.params.length;
  const fixed = opts.fixed ?? {};
  for (const k of Object.keys(fixed)) if (!model.params.includes(k)) return failedFit(modelName, model.params, n, `"${k}" is not a parameter of ${modelName} (its parameters: ${model.params.join(", ")}).`, fixed);
  const free = model.params.map((p) => !(p in fixed));
  const pf = free.filter(Boolean).length;
  const bad = checkData(t, y, pf);
  if (bad) return failedFit(modelName, model.params, n, `No fit: ${bad}`, fixed);

  const weighting = opts.weighting ?? { kind: "none" };
  let w: Float64Array | null;
  try {
    w = weightsOf(weighting, n);
  } catch (e) {
    return failedFit(modelName, model.params, n, `No fit: ${(e as Error).message}.`, fixed);
  }
  const sw = w ? w.map(Math.sqrt) : null;
  const fbuf = new Float64Array(n);
  const problem = {
    n,
    p: P,
    residuals(x: Float64Array, out: Float64Array) {
      model.evaluate(t, x, fbuf);
      for (let i = 0; i < n; i++) out[i] = (fbuf[i]! - y[i]!) * (sw ? sw[i]! : 1);
    },
    jacobian(x: Float64Array, J: Float64Array) {
      model.jacobian(t, x, J);
      if (sw) for (let j = 0; j < P; j++) for (let i = 0; i < n; i++) J[j * n + i] = J[j * n + i]! * sw[i]!;
    },
  };
  const vec = (start: Record<string, number>) => model.params.map((p) => (p in fixed ? fixed[p]! : (start[p] ?? 1)));
  const lower = model.params.map((p) => opts.lower?.[p] ?? -Infinity);
  const upper = model.params.map((p) => opts.upper?.[p] ?? Infinity);

  let best: LmResult | null = null;
  let startsTried = 0;
  const deadline = Date.now() + (opts.timeBudgetMs ?? FIT_TIME_BUDGET_MS);
  for (const s of [opts.start, ...(opts.alternativeStarts ?? [])]) {
    if (startsTried > 0 && Date.now() > deadline) break;
    startsTried++;
    const res = levenbergMarquardt(problem, vec(s), { free, lower, upper, maxIterations: opts.maxIterations, solver: opts.solver, deadline });
    if (res.converged && Number.isFinite(res.ssr) && (!best || !best.converged || res.ssr < best.ssr)) best = res;
    else if (!best) best = res;
    if (best.converged) break;
  }
  const lm = best!;
  if (!lm.converged) {
    const why =
      lm.stop === "max-iterations"
        ? `it did not converge within ${lm.iterations} iterations`
        : lm.stop === "time-budget"
          ? `it ran past its time limit of ${((opts.timeBudgetMs ?? FIT_TIME_BUDGET_MS) / 1000).toFixed(0)} s`
          : lm.stop === "not-finite"
          ? "the model gave values that are not finite numbers (overflow, or a parameter outside the model's domain)"
          : "it stopped making progress before meeting the convergence tests";
    return {
      ...failedFit(modelName, model.params, n, `The fit failed: ${why} (${startsTried} start${startsTried > 1 ? "s" : ""} tried). Try other start values or fix a parameter.`, fixed),
      iterations: lm.iterations,
    };
  }

  // Residuals in data units (unweighted) for display and diagnostics.
  model.evaluate(t, lm.x, fbuf);
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) resid[i] = y[i]! - fbuf[i]!;
  const dof = n - pf;
  const ssrWeighted = lm.ssr;
  const s2 = ssrWeighted / dof;
  const warnings: string[] = [];
  const messages: string[] = [`Converged in ${lm.iterations} iterations.`];

  // Covariance: s²(JᵀWJ)⁻¹ for unweighted or relative weights, (JᵀWJ)⁻¹ for absolute σ.
  const factor = weighting.kind === "absolute" ? 1 : s2;
  const cov = lm.inverseHessian;
  const se = new Array<number | null>(pf).fill(null);
  const tq = tQuantile(0.975, dof);
  if (!cov) {
    messages.push("Standard errors cannot be estimated: the Jacobian is singular at the solution (the data cannot separate the parameters).");
  } else {
    for (let k = 0; k < pf; k++) se[k] = Math.sqrt(Math.max(0, cov[k * pf + k]! * factor));
  }
  const boundNames = lm.atBound.map((j) => model.params[j]!);
  if (boundNames.length) {
    messages.push(`Standard errors are not given for ${boundNames.join(", ")}: the estimate sits on its bound.`);
    for (const j of lm.atBound) se[lm.freeIndex.indexOf(j)] = null;
  }

  let correlation: number[][] | null = null;
  const correlationNames = lm.freeIndex.map((j) => model.params[j]!);
  if (cov) {
    correlation = [];
    for (let a = 0; a < pf; a++) {
      const row: number[] = [];
      for (let b = 0; b < pf; b++) row.push(cov[a * pf + b]! / Math.sqrt(cov[a * pf + a]! * cov[b * pf + b]!));
      correlation.push(row);
    }
    const apart: string[] = [];
    for (let a = 0; a < pf; a++)
      for (let b = a + 1; b < pf; b++) {
        const rho = correlation[a]![b]!;
        if (Math.abs(rho) >= INDISTINGUISHABLE) apart.push(`${correlationNames[a]} and ${correlationNames[b]} (r = ${rho.toFixed(4)})`);
        else if (Math.abs(rho) >= CORRELATION_WARNING)
          warnings.push(`${correlationNames[a]} and ${correlationNames[b]} are strongly correlated (r = ${rho.toFixed(3)}): their individual uncertainties are larger than they look.`);
      }
    if (apart.length)
      warnings.unshift(
        `${apart.join(", ")} cannot be told apart by these data: a change in one is matched by the other, so neither is determined on its own. Fix one at a measured value, record for longer, or choose a simpler model.`,
      );
  } else {
    const pair = mostAlike(problem, lm.x, lm.freeIndex, n);
    if (pair) warnings.push(`${model.params[pair[0]]} and ${model.params[pair[1]]} cannot be told apart by these data: no standard errors can be given. Fix one at a measured value or choose a simpler model.`);
  }
  const outliers = outlyingPoints(problem, lm, n, dof, s2, t, opts.timeOrigin ?? 0);
  if (outliers) warnings.push(outliers);

  const parameters: ParameterEstimate[] = model.params.map((name, j) => {
    if (!free[j]) return { name, value: fixed[name]!, se: null, ci95: null, fixed: true };
    const k = lm.freeIndex.indexOf(j);
    const v = lm.x[j]!;
    const e = se[k] ?? null;
    return { name, value: v, se: e, ci95: e === null ? null : [v - tq * e, v + tq * e], fixed: false };
  });

  const ybar = fsum(y) / n;
  let sst = 0,
    ssr = 0;
  for (let i = 0; i < n; i++) {
    sst += (y[i]! - ybar) ** 2;
    ssr += resid[i]! ** 2;
  }
  const rt = runsTest(resid);
  return {
    model: modelName,
    n,
    parameters,
    ssr: weighting.kind === "none" ? ssr : ssrWeighted,
    dof,
    r2: sst > 0 ? 1 - ssr / sst : null,
    rmse: Math.sqrt(ssr / n),
    aicc: aicc(weighting.kind === "none" ? ssr : ssrWeighted, n, pf),
    runs: rt.runs,
    runs_z: rt.z,
    runs_p: rt.p,
    durbin_watson: durbinWatson(resid),
    converged: true,
    iterations: lm.iterations,
    message: messages.join(" "),
    correlation,
    correlation_names: correlationNames,
    warnings,
    weighting: weighting.kind,
    residuals: resid,
    fitted: fbuf,
  };
}

/** The two free parameters whose Jacobian columns are most nearly parallel (when the covariance is singular). */
function mostAlike(problem: { jacobian(x: Float64Array, J: Float64Array): void; p: number }, x: Float64Array, free: number[], n: number): [number, number] | null {
  if (free.length < 2) return null;
  const J = new Float64Array(n * problem.p);
  problem.jacobian(x, J);
  const norm = (j: number) => Math.sqrt(J.subarray(j * n, (j + 1) * n).reduce((s, v) => s + v * v, 0));
  let best: [number, number] | null = null,
    bestCos = -1;
  for (let a = 0; a < free.length; a++)
    for (let b = a + 1; b < free.length; b++) {
      const ja = free[a]!,
        jb = free[b]!;
      let dot = 0;
      for (let i = 0; i < n; i++) dot += J[ja * n + i]! * J[jb * n + i]!;
      const c = Math.abs(dot) / (norm(ja) * norm(jb) || 1);
      if (c > bestCos) [bestCos, best] = [c, [ja, jb]];
    }
  return best;
}

/**
 * Internally studentized residuals r_i = e_i / (s·sqrt(1 − h_ii)), h_ii from the Jacobian at the solution (Belsley,
 * Kuh & Welsch 1980; NIST/SEMATECH e-Handbook 4.4.5.1); a point is named when |r_i| exceeds the Bonferroni-corrected
 * two-sided 5 % quantile of t (at least 3), so a clean trace of any length names none.
 */
function outlyingPoints(
  problem: { jacobian(x: Float64Array, J: Float64Array): void; residuals(x: Float64Array, out: Float64Array): void; p: number },
  lm: LmResult,
  n: number,
  dof: number,
  s2: number,
  t: Float64Array,
  origin: number,
): string | null {
  const pf = lm.freeIndex.length;
  if (!lm.inverseHessian || dof < 3 || !(s2 > 0)) return null;
  const r = new Float64Array(n);
  problem.residuals(lm.x, r);
  const s = Math.sqrt(s2);
  // No standardized residual beyond 2 on a series of 20 points or more: reaching the limit (at least 3) would need a
  // leverage above 5/9, which kinetic traces of that length do not have, so the leverages are not computed.
  let worst = 0;
  for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(r[i]!));
  if (n >= 20 && worst / s < 2) return null;
  const limit = Math.max(3, tQuantile(1 - 0.025 / n, dof));
  // Leverages h_ii = J_i (JᵀJ)⁻¹ J_iᵀ; on long series (over LEVERAGE_UP_TO points) every h_ii is near p/n and the
  // standardized residual e_i/s is used, sparing a second Jacobian of the whole series.
  const J = n <= LEVERAGE_UP_TO ? new Float64Array(n * problem.p) : null;
  if (J) problem.jacobian(lm.x, J);
  const H = lm.inverseHessian;
  const found: Array<{ i: number; z: number }> = [];
  const row = new Float64Array(pf);
  for (let i = 0; i < n; i++) {
    let h = 0;
    if (J) {
      for (let a = 0; a < pf; a++) row[a] = J[lm.freeIndex[a]! * n + i]!;
      for (let a = 0; a < pf; a++) {
        let q = 0;
        for (let b = 0; b < pf; b++) q += H[a * pf + b]! * row[b]!;
        h += row[a]! * q;
      }
      if (!(h < 1)) continue;
    }
    // residuals() gives fitted − observed (weighted); the reader's residual is observed − fitted.
    const z = -r[i]! / (s * Math.sqrt(1 - h));
    if (Math.abs(z) > limit) found.push({ i, z });
  }
  if (!found.length) return null;
  found.sort((a, b) => Math.abs(b.z) - Math.abs(a.z));
  const named = found.slice(0, 5).map(({ i, z }) => `t = ${formatTime(t[i]! + origin)} s (r = ${z.toFixed(1)})`);
  return `${found.length === 1 ? "One reading lies" : `${found.length} readings lie`} far off the fitted curve (studentized residual beyond ±${limit.toFixed(1)}): ${named.join(", ")}${found.length > 5 ? ", …" : ""}. A single such point can move k by several per cent: check it, and exclude it with a reason if it is an artefact.`;
}

/** Up to this many points, outlying readings are judged with their leverages (studentized residuals). */
const LEVERAGE_UP_TO = 20_000;

function formatTime(v: number): string {
  return Math.abs(v) >= 1e6 ? v.toFixed(1) : String(Number(v.toPrecision(6)));
}
