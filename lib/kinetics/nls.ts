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
}

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
    for (let a = 0; a < pf; a++)
      for (let b = a + 1; b < pf; b++)
        if (Math.abs(correlation[a]![b]!) >= CORRELATION_WARNING)
          warnings.push(`${correlationNames[a]} and ${correlationNames[b]} are strongly correlated (r = ${correlation[a]![b]!.toFixed(3)}): their individual uncertainties are larger than they look.`);
  }

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
