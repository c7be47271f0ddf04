// How every built-in nonlinear model is fitted: times counted from the first reading inside the fit (so a Unix-time
// stamp of 1.7e9 s neither overflows a start rule nor costs digits), several starts, relabelling of exchangeable
// parameters, then the values moved back to the user's origin with their covariance (delta method, exact for a
// reparametrization), and two honesty checks: a parameter running off towards infinity is not "converged", and a fit
// that fails on data with no curvature says so.
import { curvatureT } from "../diagnostics";
import { asFloat64, failedFit, fitNonlinear } from "../nls";
import { tQuantile } from "../stats";
import type { FitResult, ParameterEstimate } from "../types";
import { ranOff, type Dimension, type FitSpec, type ModelDescriptor, type NonlinearModel } from "./types";

export class FitSpecError extends Error {
  override name = "FitSpecError";
}

/** Built-in models on series this long factor each LM step by the scaled normal equations (bench: ~4x faster at
 * 1e6 points, 2x at 1e4, 1.5x at 1e3; QR takes over when the scaled JᵀJ is ill-conditioned, and the covariance always
 * comes from QR). The NIST StRD problems (at most a few hundred points) keep QR throughout. */
const NORMAL_EQUATIONS_FROM = 1_000;

/** A fitted rate this many times its natural scale (the inverse reading interval) has run away; a value in the data's
 * units (an amplitude, an end value) this many times the data's own scale has too. */
const RUNAWAY_RATE = 1e6;
const RUNAWAY_VALUE = 1e3;

export function nonlinearDescriptor(meta: Omit<ModelDescriptor, "fit" | "curve" | "family">, model: NonlinearModel): ModelDescriptor {
  const names = meta.params.map((p) => p.name);
  return {
    ...meta,
    family: "nonlinear",
    fn: model,
    curve(t, values) {
      const out = new Float64Array(t.length);
      model.evaluate(t, names.map((n) => values[n]!), out);
      return out;
    },
    fit: (t, y, spec) => fitBuiltIn(meta.id, meta.params, model, t, y, spec),
  };
}

function fitBuiltIn(id: string, params: ModelDescriptor["params"], model: NonlinearModel, tIn: Float64Array, y: Float64Array, spec: FitSpec): FitResult {
  const fixed = spec.fixed ?? {};
  for (const k of [...Object.keys(fixed), ...Object.keys(spec.start ?? {})])
    if (!model.params.includes(k)) throw new FitSpecError(`"${k}" is not a parameter of ${id} (its parameters: ${model.params.join(", ")}).`);
  let tmin = Infinity;
  for (let i = 0; i < tIn.length; i++) if (tIn[i]! < tmin) tmin = tIn[i]!;
  // Fixing a value that belongs to t = 0 (a0, an amplitude) keeps the fit in the user's own times.
  const tref = model.toOrigin && Number.isFinite(tmin) && tmin !== 0 && !Object.keys(fixed).some((k) => model.originDependent.includes(k)) ? tmin : 0;
  const t = tref === 0 ? tIn : tIn.map((v) => v - tref);
  const userStarts = Object.fromEntries(Object.entries(spec.start ?? {}).filter(([k]) => tref === 0 || !model.originDependent.includes(k)));
  const auto = model.starts(t, y, fixed);
  const starts = Object.keys(userStarts).length ? [{ ...auto[0], ...userStarts }, ...auto] : auto;
  const run = (s: Array<Record<string, number>>) =>
    fitNonlinear(id, model, t, y, {
      start: s[0]!,
      alternativeStarts: s.slice(1),
      fixed,
      lower: model.lower,
      weighting: spec.weighting,
      solver: t.length >= NORMAL_EQUATIONS_FROM ? "normal-equations" : "qr",
      timeOrigin: tref,
    });
  let r = run(starts);
  if (r.converged && model.normalise) {
    const values = Object.fromEntries(r.parameters.map((p) => [p.name, p.value!]));
    const before = JSON.stringify(values);
    const note = model.normalise(values);
    // Relabelled parameters are refitted from the relabelled point, so SEs and correlations follow the labels.
    if (JSON.stringify(values) !== before) r = run([values]);
    if (note) r.warnings.push(note);
  }
  if (r.converged) {
    const away = runaway(r, params, t, y);
    if (away) return { ...failedFit(id, model.params, t.length, [away, noCurvature(t, y)].filter(Boolean).join(" "), fixed), iterations: r.iterations };
    const doubt = model.check?.(r);
    if (doubt) r.warnings.push(doubt);
    const flat = model.straight ? null : noCurvature(t, y);
    if (flat) r.warnings.push(flat.replace("so a curved model cannot find its rate constant here", "so the rate constant rests on the model's shape rather than on the data"));
  } else {
    const flat = noCurvature(t, y);
    if (flat) r.message += ` ${flat}`;
  }
  if (r.converged && tref !== 0) r = moveToOrigin(r, model, tref);
  return r;
}

function naturalScale(dim: Dimension, yScale: number, dt: number): number | null {
  switch (dim) {
    case "y":
      return RUNAWAY_VALUE * yScale;
    case "1/t":
      return RUNAWAY_RATE / dt;
    case "y/t":
      return (RUNAWAY_RATE * yScale) / dt;
    case "1/(y t)":
      return RUNAWAY_RATE / (yScale * dt);
    default:
      return null;
  }
}

/** A free parameter far beyond anything the data can hold: the fit slid along a valley towards infinity. */
function runaway(r: FitResult, params: ModelDescriptor["params"], t: Float64Array, y: Float64Array): string | null {
  let ymin = Infinity,
    ymax = -Infinity,
    yabs = 0;
  for (let i = 0; i < y.length; i++) {
    ymin = Math.min(ymin, y[i]!);
    ymax = Math.max(ymax, y[i]!);
    yabs = Math.max(yabs, Math.abs(y[i]!));
  }
  // Readings usually come in time order: only an unordered series pays for a sorted copy.
  let ordered = true;
  for (let i = 1; i < t.length && ordered; i++) if (t[i]! < t[i - 1]!) ordered = false;
  const sorted = ordered ? t : Float64Array.from(t).sort();
  let dt = Infinity;
  for (let i = 1; i < sorted.length; i++) if (sorted[i]! > sorted[i - 1]!) dt = Math.min(dt, sorted[i]! - sorted[i - 1]!);
  if (!Number.isFinite(dt)) return null;
  const yScale = yabs + (ymax - ymin);
  const off = r.parameters.filter((p) => {
    if (p.fixed || p.value === null) return false;
    const spec = params.find((q) => q.name === p.name);
    const scale = spec ? naturalScale(spec.dimension, yScale, dt) : null;
    return scale !== null && Math.abs(p.value) > scale;
  });
  if (!off.length) return null;
  return `The fit did not settle: ${ranOff(off)}, far beyond anything these data can hold. Fix a parameter at a measured value, give start values, leave out a spike, or choose another model.`;
}

/** Says so when the data show no curvature, the usual reason a curved model cannot find its rate constant. */
export function noCurvature(t: Float64Array, y: Float64Array): string | null {
  const c = curvatureT(t, y);
  if (c === null || Math.abs(c) >= 2) return null;
  return `The data show no curvature (quadratic term t = ${c.toFixed(2)}): a straight line describes them as well as a curve, so a curved model cannot find its rate constant here. Fit zero order (a constant rate), or record for longer.`;
}

/** Values fitted with times counted from tref, moved to the user's origin with their covariance. */
function moveToOrigin(r: FitResult, model: NonlinearModel, tref: number): FitResult {
  const names = model.params;
  const P = names.length;
  const values = Object.fromEntries(r.parameters.map((p) => [p.name, p.value!]));
  const moved = model.toOrigin!(values, tref);
  // Full covariance over all parameters (fixed ones have none) from the free parameters' SEs and correlations.
  const se = names.map((n) => r.parameters.find((p) => p.name === n)!.se);
  const C: number[][] = names.map(() => new Array<number>(P).fill(0));
  const pos = (n: string) => r.correlation_names.indexOf(n);
  for (let a = 0; a < P; a++)
    for (let b = 0; b < P; b++) {
      const ia = pos(names[a]!),
        ib = pos(names[b]!);
      if (ia < 0 || ib < 0 || se[a] === null || se[b] === null) continue;
      const rho = r.correlation ? r.correlation[ia]![ib]! : a === b ? 1 : 0;
      C[a]![b] = rho * se[a]! * se[b]!;
    }
  const G = moved.gradient;
  const cov: number[][] = names.map(() => new Array<number>(P).fill(0));
  for (let i = 0; i < P; i++)
    for (let j = 0; j < P; j++) {
      let s = 0;
      for (let a = 0; a < P; a++) for (let b = 0; b < P; b++) s += G[i]![a]! * C[a]![b]! * G[j]![b]!;
      cov[i]![j] = s;
    }
  const tq = tQuantile(0.975, r.dof);
  // A moved value whose SE would need one that is not available stays without an SE.
  const seKnown = (i: number) => G[i]!.every((g, a) => g === 0 || r.parameters.find((p) => p.name === names[a])!.fixed || se[a] !== null);
  const parameters: ParameterEstimate[] = r.parameters.map((p) => {
    const i = names.indexOf(p.name);
    const v = moved.values[p.name];
    if (p.fixed) return p;
    if (v === null || v === undefined || !Number.isFinite(v)) return { ...p, value: null, se: null, ci95: null };
    const s = seKnown(i) ? Math.sqrt(Math.max(0, cov[i]![i]!)) : null;
    return { ...p, value: v, se: s, ci95: s === null ? null : [v - tq * s, v + tq * s] };
  });
  let correlation = r.correlation;
  if (correlation) {
    const idx = r.correlation_names.map((n) => names.indexOf(n));
    correlation = idx.map((i) => idx.map((j) => cov[i]![j]! / Math.sqrt(cov[i]![i]! * cov[j]![j]!)));
  }
  const warnings = [...r.warnings, ...moved.notes];
  const message = moved.notes.length ? `${r.message} ${moved.notes.join(" ")}` : r.message;
  return { ...r, parameters, correlation, warnings, message };
}

export { asFloat64 };
