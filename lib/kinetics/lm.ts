// Levenberg–Marquardt for nonlinear least squares: damping scaled by diag(JᵀJ) (Moré), steps from a QR of J (never the
// normal equations), acceptance by the gain ratio with Nielsen's damping update, relative convergence tests, box bounds
// by projection, fixed parameters.
import { gramFactor, householderQR, inverseRtR, solveUpper, streamingQR } from "./linalg";

export interface LsqProblem {
  /** Number of residuals. */
  n: number;
  /** Number of parameters (free and fixed). */
  p: number;
  /** Weighted residuals sqrt(w)·(f(x) − y) into `out`. */
  residuals(x: Float64Array, out: Float64Array): void;
  /** Weighted Jacobian of the residuals, n×p column-major, into `J`. */
  jacobian(x: Float64Array, J: Float64Array): void;
  /** Per parameter, the residual rows [start, end) outside which its Jacobian column is zero (block-structured problems). */
  support?: ReadonlyArray<readonly [number, number]>;
}

export interface LmOptions {
  free?: readonly boolean[];
  lower?: readonly number[];
  upper?: readonly number[];
  maxIterations?: number;
  /** Relative reduction of the sum of squares below which the fit has converged. */
  ftol?: number;
  /** Relative (scaled) step size below which the fit has converged. */
  xtol?: number;
  /** Largest cosine between the residual vector and a Jacobian column at convergence. */
  gtol?: number;
  /**
   * How each step's least-squares problem is factored. "qr" (default) keeps the condition number of J;
   * "normal-equations" forms the column-scaled JᵀJ in one pass and falls back to QR whenever its Cholesky factor
   * shows a condition number above 1e6 (for long, well-conditioned built-in models, where it is several times faster).
   * The covariance at the solution always comes from a QR of J.
   */
  solver?: "qr" | "normal-equations";
  /** Wall-clock time (Date.now()) after which the fit stops unconverged with stop "time-budget". */
  deadline?: number;
}

export type LmStop = "ftol" | "xtol" | "gtol" | "zero-residual" | "max-iterations" | "no-progress" | "not-finite" | "time-budget";

export interface LmResult {
  x: Float64Array;
  ssr: number;
  iterations: number;
  evaluations: number;
  converged: boolean;
  stop: LmStop;
  /** Unscaled covariance factor (JᵀJ)⁻¹ over the free parameters at the solution, or null when J is rank-deficient. */
  inverseHessian: Float64Array | null;
  freeIndex: number[];
  /** Free parameters sitting on a bound at the solution. */
  atBound: number[];
}

const DEFAULTS = { maxIterations: 1000, ftol: 1e-17, xtol: 1e-12, gtol: 1e-14 };

function sumsq(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]! * v[i]!;
  return s;
}

export function levenbergMarquardt(problem: LsqProblem, start: ArrayLike<number>, options: LmOptions = {}): LmResult {
  const { n, p } = problem;
  const opts = {
    ...options,
    maxIterations: options.maxIterations ?? DEFAULTS.maxIterations,
    ftol: options.ftol ?? DEFAULTS.ftol,
    xtol: options.xtol ?? DEFAULTS.xtol,
    gtol: options.gtol ?? DEFAULTS.gtol,
  };
  const freeIndex: number[] = [];
  for (let j = 0; j < p; j++) if (opts.free?.[j] ?? true) freeIndex.push(j);
  const pf = freeIndex.length;
  const lower = Float64Array.from({ length: p }, (_, j) => opts.lower?.[j] ?? -Infinity);
  const upper = Float64Array.from({ length: p }, (_, j) => opts.upper?.[j] ?? Infinity);

  const x = Float64Array.from(start);
  for (let j = 0; j < p; j++) x[j] = Math.min(upper[j]!, Math.max(lower[j]!, x[j]!));
  const r = new Float64Array(n);
  const rTrial = new Float64Array(n);
  const Jfull = new Float64Array(n * p);
  const xTrial = new Float64Array(p);
  let evaluations = 1;

  problem.residuals(x, r);
  let F = sumsq(r);
  const base = { freeIndex, atBound: [] as number[] };
  if (!Number.isFinite(F)) {
    return { x, ssr: F, iterations: 0, evaluations, converged: false, stop: "not-finite", inverseHessian: null, ...base };
  }

  // The working set: free parameters not held on a bound by a gradient that pushes outwards (an active-set
  // projection; stepping them and clipping would stall the other parameters).
  let work: number[] = freeIndex.map((_, k) => k);
  let pw = pf;
  // Factor J = QR over the working columns at the current point; keep R, Qᵀr and the column norms.
  let R: Float64Array = new Float64Array(pf * pf);
  let qtr: Float64Array = new Float64Array(pf);
  const colNorm = new Float64Array(pf);
  const D = new Float64Array(pf); // scaling: running max of column norms (Moré), per free parameter
  const grad = new Float64Array(pf);
  const factor = (): boolean => {
    problem.jacobian(x, Jfull);
    // Column norms and the gradient: from the Gram pass when the normal equations are in use (it computes them
    // anyway), otherwise from one pass over J.
    const gram = opts.solver === "normal-equations" ? gramFactor(Jfull, n, freeIndex, r, problem.support) : null;
    for (let k = 0; k < pf; k++) {
      let s = 0,
        g = 0;
      if (gram) {
        s = gram.G[k * pf + k]!;
        g = gram.g[k]!;
      } else {
        const src = freeIndex[k]! * n;
        for (let i = 0; i < n; i++) {
          const v = Jfull[src + i]!;
          s += v * v;
          g += v * r[i]!;
        }
      }
      if (!Number.isFinite(s) || !Number.isFinite(g)) return false;
      colNorm[k] = Math.sqrt(s);
      D[k] = Math.max(D[k]!, colNorm[k]!) || 1;
      grad[k] = g;
    }
    work = [];
    for (let k = 0; k < pf; k++) {
      const j = freeIndex[k]!;
      const heldLow = x[j] === lower[j] && grad[k]! > 0;
      const heldHigh = x[j] === upper[j] && grad[k]! < 0;
      if (!heldLow && !heldHigh) work.push(k);
    }
    pw = work.length;
    const cols = work.map((k) => freeIndex[k]!);
    // The Gram factor of all free columns serves as it is when nothing is held on a bound.
    const factored = gram && pw === pf ? gram : opts.solver === "normal-equations" ? gramFactor(Jfull, n, cols, r, problem.support) : null;
    const { R: Rw, qtb } = factored ?? streamingQR(Jfull, n, cols, r);
    R = Rw;
    qtr = qtb;
    return R.every(Number.isFinite);
  };

  /** Largest cosine between r and a working Jacobian column (the projected gradient test). */
  const gradientCosine = (): number => {
    const rn = Math.sqrt(F);
    if (rn === 0) return 0;
    let worst = 0;
    for (const k of work) if (colNorm[k]! > 0) worst = Math.max(worst, Math.abs(grad[k]!) / (colNorm[k]! * rn));
    return worst;
  };

  const project = (h: Float64Array) => {
    xTrial.set(x);
    for (let q = 0; q < pw; q++) {
      const j = freeIndex[work[q]!]!;
      xTrial[j] = Math.min(upper[j]!, Math.max(lower[j]!, x[j]! + h[q]!));
    }
  };

  // Near the optimum a few undamped Gauss–Newton steps recover the last digits that damping leaves behind.
  const polish = () => {
    for (let k = 0; k < 4; k++) {
      if (!factor() || pw === 0) return;
      const h = solveUpper(R, pw, qtr.map((v) => -v));
      if (!h) return;
      project(h);
      problem.residuals(xTrial, rTrial);
      evaluations++;
      const Fn = sumsq(rTrial);
      if (!(Fn <= F)) return;
      const same = xTrial.every((v, j) => v === x[j]);
      x.set(xTrial);
      r.set(rTrial);
      F = Fn;
      if (same) return;
    }
  };

  const finish = (converged: boolean, stop: LmStop, iterations: number): LmResult => {
    // (The normal-equations path is for long, well-conditioned series, whose steps already meet xtol.)
    if (converged && pf > 0 && F > 0 && opts.solver !== "normal-equations") polish();
    const atBound = freeIndex.filter((j) => x[j] === lower[j] || x[j] === upper[j]);
    let inverseHessian: Float64Array | null = null;
    if (pf > 0 && factor()) {
      // QR of J·S with S = diag(1/‖J_k‖) is R·S: scaling the columns makes the rank test and the inverse independent
      // of parameter units without a second factorisation.
      // A well-conditioned Gram factor is accurate enough here (its error grows with cond², which it has bounded);
      // otherwise, and always on the QR path, the R of J itself.
      const gram = opts.solver === "normal-equations" ? gramFactor(Jfull, n, freeIndex, r, problem.support) : null;
      const Rall = gram ? gram.R : streamingQR(Jfull, n, freeIndex, r).R;
      const Rs = new Float64Array(pf * pf);
      for (let i = 0; i < pf; i++) for (let k = i; k < pf; k++) Rs[i * pf + k] = Rall[i * pf + k]! / (colNorm[k]! || 1);
      const Cs = inverseRtR(Rs, pf);
      if (Cs) {
        inverseHessian = new Float64Array(pf * pf);
        for (let a = 0; a < pf; a++)
          for (let b = 0; b < pf; b++) inverseHessian[a * pf + b] = Cs[a * pf + b]! / ((colNorm[a]! || 1) * (colNorm[b]! || 1));
      }
    }
    return { x, ssr: F, iterations, evaluations, converged, stop, inverseHessian, freeIndex, atBound };
  };

  if (pf === 0) return finish(true, "xtol", 0);
  if (!factor()) return finish(false, "not-finite", 0);
  if (F === 0) return finish(true, "zero-residual", 0);

  let lambda = 1e-3;
  let nu = 2;

  for (let it = 1; it <= opts.maxIterations; it++) {
    if (pw === 0 || gradientCosine() <= opts.gtol) return finish(true, "gtol", it - 1);
    if (opts.deadline !== undefined && Date.now() > opts.deadline) return finish(false, "time-budget", it - 1);
    // Solve min ‖[R; √λ D] h + [Qᵀr; 0]‖ by a small QR.
    const m = 2 * pw;
    const M = new Float64Array(m * pw);
    const rhs = new Float64Array(m);
    for (let q = 0; q < pw; q++) {
      for (let i = 0; i <= q; i++) M[q * m + i] = R[i * pw + q]!;
      M[q * m + pw + q] = Math.sqrt(lambda) * D[work[q]!]!;
      rhs[q] = -qtr[q]!;
    }
    const R2 = householderQR(M, m, pw, [rhs]);
    const h = solveUpper(R2, pw, rhs);
    if (!h) {
      lambda *= nu;
      nu *= 2;
      if (lambda > 1e30) return finish(false, "no-progress", it);
      continue;
    }
    project(h);
    // Predicted reduction of ‖r‖² for the (possibly projected) step: ‖Qᵀr‖² − ‖Qᵀr + R h‖².
    let pred = 0,
      stepScaled = 0,
      xScaled = 0;
    for (let i = 0; i < pw; i++) {
      let rh = qtr[i]!;
      for (let q = i; q < pw; q++) {
        const j = freeIndex[work[q]!]!;
        rh += R[i * pw + q]! * (xTrial[j]! - x[j]!);
      }
      pred += qtr[i]! * qtr[i]! - rh * rh;
    }
    for (let k = 0; k < pf; k++) {
      const j = freeIndex[k]!;
      stepScaled += (D[k]! * (xTrial[j]! - x[j]!)) ** 2;
      xScaled += (D[k]! * x[j]!) ** 2;
    }
    stepScaled = Math.sqrt(stepScaled);
    xScaled = Math.sqrt(xScaled);
    // Each parameter's own step must be small relative to its value, so a small parameter is not left
    // half-converged beside a large one (the scaled norm alone allows that).
    let everyStepSmall = true;
    for (let k = 0; k < pf; k++) {
      const j = freeIndex[k]!;
      const step = Math.abs(xTrial[j]! - x[j]!);
      if (step > opts.xtol * Math.abs(x[j]!) && D[k]! * step > 1e-15 * xScaled) everyStepSmall = false;
    }
    problem.residuals(xTrial, rTrial);
    evaluations++;
    const Fn = sumsq(rTrial);
    const actual = F - Fn;
    const rho = Number.isFinite(Fn) && pred > 0 ? actual / pred : -1;

    if (rho > 0) {
      x.set(xTrial);
      r.set(rTrial);
      const Fold = F;
      F = Fn;
      lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      nu = 2;
      if (F === 0) return finish(true, "zero-residual", it);
      if (!factor()) return finish(false, "not-finite", it);
      if (actual <= opts.ftol * Fold && pred <= opts.ftol * Fold) return finish(true, "ftol", it);
      if (everyStepSmall) return finish(true, "xtol", it);
    } else {
      // Even a rejected step can show that no further progress is possible at this precision.
      if (everyStepSmall && lambda < 1e10) return finish(true, "xtol", it);
      lambda *= nu;
      nu *= 2;
      if (lambda > 1e30) {
        // Stuck: converged only if the gradient is negligible at double precision.
        return finish(gradientCosine() <= 1e-8, "no-progress", it);
      }
    }
  }
  return finish(false, "max-iterations", opts.maxIterations);
}
