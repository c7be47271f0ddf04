// Studies: rate constants from saved fit versions, grouped across temperatures (Arrhenius, Eyring, Q10, predictions)
// or across excess concentrations (k_obs → k2). Stored as immutable versions with a content hash, like fits.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { fitsForStudy, getStudy, insertStudyVersion, listLatestStudies, listStudyVersions } from "@/db/queries/studies";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { claimNextVersion, writeVersion } from "@/lib/records";
import { canonicalJson, csvCell } from "@/lib/fits";
import {
  arrhenius,
  arrheniusBand,
  arrheniusLine,
  celsiusToKelvin,
  ENGINE_VERSION,
  halfLife,
  KELVIN_OFFSET,
  predictRateConstant,
  q10,
  secondOrderFromObserved,
  t90,
  TemperatureDataError,
  GlobalFitError,
  arrheniusFormRate,
  includedPoints,
  tQuantile,
  PRIMARY_MODEL,
  type GlobalFitResult,
  type GlobalRun,
  type RatePoint,
} from "@/lib/kinetics";
import { getFit } from "@/db/queries/fits";
import { runJob } from "@/lib/jobs/pool";
import { decimateIndices } from "@/lib/plot/decimate";
import { readSeries } from "@/lib/runs";
import type { ChangeStudy, CreateStudy, StudyMember } from "@/lib/schemas/studies";

export { PREDICTION_CAUTION } from "./caution";
import { PREDICTION_CAUTION } from "./caution";

export interface ResolvedMember extends StudyMember {
  fit_title: string;
  fit_version: number;
  run_id: number;
  run_name: string;
  series_name: string;
  run_temperature_c: number | null;
  k: number;
  se: number | null;
  temperature_used_c: number | null;
}

async function resolveMembers(db: Knex, labId: number, members: StudyMember[]): Promise<ResolvedMember[]> {
  const rows = await fitsForStudy(db, labId, members.map((m) => m.fitId));
  const byId = new Map(rows.map((r) => [r.id, r]));
  return members.map((m) => {
    const f = byId.get(m.fitId);
    if (!f) throw new AppError({ code: "not_found", message: `There is no fit ${m.fitId} in this lab.` });
    if (f.k_value === null) throw new AppError({ code: "unprocessable", message: `Fit ${f.title} (v${f.version}) has no rate constant to use.` });
    const overridden = m.temperature_c !== undefined && m.temperature_c !== null && m.temperature_c !== f.temperature_c;
    if (overridden && !m.temperature_reason)
      throw new AppError({ code: "unprocessable", message: `Say why ${f.run_name} is at ${m.temperature_c} °C and not the ${f.temperature_c ?? "unrecorded"} °C of its run (a reason is required).` });
    return {
      fitId: m.fitId,
      ...(overridden ? { temperature_c: m.temperature_c, temperature_reason: m.temperature_reason } : {}),
      ...(m.excess_mol_l ? { excess_mol_l: m.excess_mol_l } : {}),
      fit_title: f.title,
      fit_version: f.version,
      run_id: f.run_id,
      run_name: f.run_name,
      series_name: f.series_name,
      run_temperature_c: f.temperature_c,
      k: f.k_value,
      se: f.k_se,
      temperature_used_c: overridden ? m.temperature_c! : f.temperature_c,
    };
  });
}

export function computeStudy(kind: "temperature" | "excess", members: ResolvedMember[], options: { weighted: boolean; target_c?: number | null }) {
  if (kind === "excess") {
    const pts = members.map((m) => {
      if (!m.excess_mol_l) throw new AppError({ code: "unprocessable", message: `${m.run_name}: give the excess reagent's concentration.` });
      return { x: m.excess_mol_l, k: m.k };
    });
    const r = secondOrderFromObserved(pts.map((p) => p.x), pts.map((p) => p.k));
    return { kind, n: pts.length, k2: { value: r.k2, se: r.se, unit: "L/(mol s)" }, intercept: { value: r.intercept, se: r.seIntercept, unit: "1/s" }, r2: r.fit.r2 };
  }
  const missing = members.find((m) => m.temperature_used_c === null);
  if (missing) throw new AppError({ code: "unprocessable", message: `${missing.run_name} has no temperature: give one (with a reason).` });
  const points: RatePoint[] = members.map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c!), k: m.k, se: options.weighted ? m.se : null }));
  try {
    const a = arrhenius(points);
    const sorted = [...points].sort((x, y) => x.temperatureK - y.temperatureK);
    // Q10 between neighbouring distinct temperatures: replicate runs at one temperature are one level (the geometric
    // mean of their k), never a "Q10" between a temperature and itself.
    const levels: RatePoint[] = [];
    for (const p of sorted) {
      const last = levels.at(-1) as (RatePoint & { lnSum: number; count: number }) | undefined;
      if (last && Math.abs(p.temperatureK - last.temperatureK) < 0.005) {
        last.lnSum += Math.log(p.k);
        last.count += 1;
        last.k = Math.exp(last.lnSum / last.count);
      } else levels.push({ temperatureK: p.temperatureK, k: p.k, se: null, lnSum: Math.log(p.k), count: 1 } as RatePoint & { lnSum: number; count: number });
    }
    const q10s = levels.slice(1).map((p, i) => ({ from_c: levels[i]!.temperatureK - KELVIN_OFFSET, to_c: p.temperatureK - KELVIN_OFFSET, q10: q10(levels[i]!, p) }));
    let band: ReturnType<typeof arrheniusBand> = [];
    let residuals: Array<{ temperature_c: number; residual: number }> = [];
    if (points.length >= 3) {
      const lo = sorted[0]!.temperatureK - 5,
        hi = sorted.at(-1)!.temperatureK + 5;
      band = arrheniusBand(points, Array.from({ length: 41 }, (_, i) => lo + ((hi - lo) * i) / 40));
      const line = arrheniusLine(points);
      residuals = points.map((p, i) => ({ temperature_c: p.temperatureK - KELVIN_OFFSET, residual: line.residuals[i]! }));
    }
    let prediction = null;
    if (options.target_c !== undefined && options.target_c !== null && points.length >= 3) {
      const pr = predictRateConstant(points, celsiusToKelvin(options.target_c));
      const lo = Math.min(...points.map((p) => p.temperatureK)) - KELVIN_OFFSET;
      const hi = Math.max(...points.map((p) => p.temperatureK)) - KELVIN_OFFSET;
      const distance = options.target_c < lo ? lo - options.target_c : options.target_c > hi ? options.target_c - hi : 0;
      prediction = {
        target_c: options.target_c,
        k: pr.k,
        k_pi95: pr.pi95,
        k_ci95: pr.ci95,
        half_life_s: halfLife(pr.k).value,
        t90_s: t90(pr.k).value,
        t90_pi95_s: [t90(pr.pi95[1]).value, t90(pr.pi95[0]).value] as [number, number],
        extrapolated: pr.extrapolated,
        extrapolation_c: distance,
        warning: pr.warning,
        caution: PREDICTION_CAUTION,
      };
    }
    return { kind, ...a, temperatures: levels.length, q10: q10s, band, residuals, prediction, weighting: a.weighted ? "by (k / SE(k))²" : "none" };
  } catch (e) {
    if (e instanceof TemperatureDataError) throw new AppError({ code: "unprocessable", message: e.message });
    throw e;
  }
}

/** A study version's content hash over its members, options, results and engine. Saving and verifying both use it. */
export function studyContentHash(c: { members: unknown; options: unknown; results: unknown; engine: string }): string {
  return createHash("sha256").update(canonicalJson({ members: c.members, options: c.options, results: c.results, engine: c.engine })).digest("hex");
}

/** What a study keeps of the global fit: numbers and per-run diagnostics (no curves), and how it compares. */
export interface StudyGlobal {
  available: boolean;
  reason?: string;
  model?: string;
  tref_c?: number;
  /** Which law the runs share: Arrhenius (temperature studies) or k_obs = k2·[B]0 (excess-concentration series). */
  form?: "arrhenius" | "excess";
  ea?: { value: number | null; se: number | null; ci95: [number, number] | null };
  k2?: { value: number | null; se: number | null; ci95: [number, number] | null };
  kref?: { value: number | null; se: number | null };
  correlation_ea_kref?: number | null;
  n?: number;
  dof?: number;
  runs?: Array<{
    fit_id: number;
    run_name: string;
    temperature_c: number | null;
    excess_mol_l?: number | null;
    n: number;
    k: number | null;
    se_k: number | null;
    ssr_share: number | null;
    runs_z: number | null;
    /** The run's residuals under the shared law, for its panel: the lowest and highest of each of 75 time buckets. */
    residuals?: { t: number[]; r: number[] };
  }>;
  /** k at the study's target temperature from the global Ea and kref, with its 95 % confidence interval (delta method). */
  prediction?: { target_c: number; k: number; ci95: [number, number]; t90_s: number; extrapolated: boolean; caution: string } | null;
  converged?: boolean;
  message?: string;
  warnings?: string[];
  /** Two-stage minus global (Ea, or k2), over their combined SE: within 2 they agree within their uncertainties. */
  agreement?: { difference: number; z: number | null; agree: boolean | null };
}

/**
 * Every member's curve fitted at once, on the points each member fit used (its window, exclusions and conversion), on a
 * worker thread: first order, each run's a0 and A∞ its own, k following the shared law: Arrhenius (Ea and kref shared)
 * for temperature studies, k_obs = k2·[B]0 (k2 shared) for excess-concentration series.
 */
/** At most about 150 residuals of a run for its panel: the app's one decimator over 75 buckets in time, 4 digits. */
function residualStrip(t: ArrayLike<number>, r: ArrayLike<number>): { t: number[]; r: number[] } {
  const keep = decimateIndices(t, r, 75);
  const p4 = (v: number) => Number(v.toPrecision(4));
  return { t: keep.map((i) => p4(t[i]!)), r: keep.map((i) => p4(r[i]!)) };
}

async function globalForStudy(db: Knex, labId: number, members: ResolvedMember[], twoStage: { value: number; se: number | null } | null, form: "arrhenius" | "excess", targetC?: number | null): Promise<StudyGlobal> {
  const runs: GlobalRun[] = [];
  const ids: number[] = [];
  for (const m of members) {
    if (form === "arrhenius" && m.temperature_used_c === null) return { available: false, reason: `${m.run_name} has no temperature.` };
    if (form === "excess" && !m.excess_mol_l) return { available: false, reason: `${m.run_name} has no excess concentration.` };
    const f = await getFit(db, labId, m.fitId);
    if (!f) return { available: false, reason: `Fit ${m.fitId} is missing.` };
    const { t, y } = await readSeries(db, labId, f.run_id, f.series_id);
    const pts = includedPoints(t, y, f.options);
    runs.push({ label: m.run_name, t: pts.t, y: pts.y, temperatureK: m.temperature_used_c === null ? null : celsiusToKelvin(m.temperature_used_c), excessMolL: m.excess_mol_l ?? null });
    ids.push(m.fitId);
  }
  let g: GlobalFitResult;
  try {
    g = await runJob("global-fit", { model: PRIMARY_MODEL, runs, form: { kind: form } });
  } catch (e) {
    if (e instanceof GlobalFitError || (e instanceof AppError && e.code === "unprocessable")) return { available: false, reason: e.message };
    throw e;
  }
  const first = g.parameters[0]!;
  const combined = twoStage?.se !== null && twoStage?.se !== undefined && first.se !== null ? Math.hypot(twoStage.se, first.se) : null;
  const difference = twoStage && first.value !== null ? twoStage.value - first.value : NaN;
  const shared =
    form === "arrhenius"
      ? { tref_c: g.tref_k! - KELVIN_OFFSET, ea: { value: first.value, se: first.se, ci95: first.ci95 }, kref: { value: g.parameters[1]!.value, se: g.parameters[1]!.se }, correlation_ea_kref: g.correlation ? g.correlation[0]![1]! : null }
      : { k2: { value: first.value, se: first.se, ci95: first.ci95 } };
  return {
    available: true,
    form,
    model: g.model,
    ...shared,
    n: g.n,
    dof: g.dof,
    runs: g.runs.map((r, i) => ({
      fit_id: ids[i]!,
      run_name: r.label,
      temperature_c: r.temperature_k === null ? null : r.temperature_k - KELVIN_OFFSET,
      excess_mol_l: runs[i]!.excessMolL ?? null,
      n: r.n,
      k: r.k.value,
      se_k: r.k.se,
      ssr_share: r.ssr_share,
      runs_z: r.runs_z,
      ...(r.residuals.length ? { residuals: residualStrip(runs[i]!.t, r.residuals) } : {}),
    })),
    prediction: form === "arrhenius" && targetC !== undefined && targetC !== null ? globalPrediction(g, targetC) : null,
    converged: g.converged,
    message: g.message,
    warnings: g.warnings,
    agreement: Number.isFinite(difference) ? { difference, z: combined ? difference / combined : null, agree: combined ? Math.abs(difference / combined) <= 2 : null } : undefined,
  };
}

/**
 * k at a temperature from the global fit's Ea and kref: k = kref·exp(−(Ea/R)(1/T − 1/Tref)), its SE by the delta method
 * over their covariance (from the SEs and their correlation), the 95 % interval with t on the fit's degrees of freedom.
 */
function globalPrediction(g: GlobalFitResult, targetC: number): StudyGlobal["prediction"] {
  const [ea, kref] = g.parameters;
  const r01 = g.correlation?.[0]?.[1];
  if (!ea || !kref || ea.value === null || kref.value === null || ea.se === null || kref.se === null || r01 === undefined || !Number.isFinite(r01) || g.tref_k === null) return null;
  const { k, dEa, dKref } = arrheniusFormRate(ea.value, kref.value, celsiusToKelvin(targetC), g.tref_k);
  const v = dEa ** 2 * ea.se ** 2 + 2 * dEa * dKref * r01 * ea.se * kref.se + dKref ** 2 * kref.se ** 2;
  const se = Math.sqrt(Math.max(v, 0));
  const tq = tQuantile(0.975, g.dof);
  const temps = g.runs.map((r) => r.temperature_k! - KELVIN_OFFSET);
  return {
    target_c: targetC,
    k,
    ci95: [Math.max(k - tq * se, 0), k + tq * se],
    t90_s: t90(k).value,
    extrapolated: targetC < Math.min(...temps) || targetC > Math.max(...temps),
    caution: PREDICTION_CAUTION,
  };
}

async function storeVersion(
  db: Knex,
  user: SignedInUser,
  input: { name: string; kind: "temperature" | "excess"; members: StudyMember[]; options: { weighted: boolean; target_c?: number | null }; previous?: { id: number; record_id: number; version: number } | null; reason?: string | null },
) {
  const resolved = await resolveMembers(db, user.labId, input.members);
  const computed = computeStudy(input.kind, resolved, input.options);
  // Beside the two-stage route, every curve fitted together (temperature studies over two or more temperatures).
  const results =
    computed.kind === "temperature" && "temperatures" in computed && computed.temperatures >= 2
      ? { ...computed, global: await globalForStudy(db, user.labId, resolved, computed.ea, "arrhenius", input.options.target_c) }
      : computed.kind === "excess" && "k2" in computed
        ? { ...computed, global: await globalForStudy(db, user.labId, resolved, computed.k2, "excess") }
        : computed;
  const contentHash = studyContentHash({ members: resolved, options: input.options, results, engine: ENGINE_VERSION });
  return writeVersion(db, async (trx) => {
    const version = await claimNextVersion(trx, "studies", user.labId, input.previous ?? null);
    const id = await insertStudyVersion(trx, {
      lab_id: user.labId,
      record_id: input.previous ? input.previous.record_id : null,
      version,
      previous_id: input.previous?.id ?? null,
      name: input.name,
      kind: input.kind,
      members: JSON.stringify(resolved),
      options: canonicalJson(input.options),
      results: JSON.stringify(results),
      engine_version: ENGINE_VERSION,
      content_hash: contentHash,
      reason: input.reason ?? null,
      author_id: user.userId,
      created_at: new Date().toISOString(),
    });
    const recordId = input.previous ? input.previous.record_id : id;
    await recordAudit(trx, {
      labId: user.labId,
      actorUserId: user.userId,
      action: input.previous ? "study.version_saved" : "study.created",
      objectType: "study",
      objectId: recordId,
      objectVersion: version,
      newValues: { name: input.name, members: input.members, options: input.options, content_hash: contentHash },
      reason: input.reason ?? null,
    });
    return { id, record_id: recordId, version, content_hash: contentHash };
  });
}

export async function createStudy(db: Knex, user: SignedInUser, input: CreateStudy) {
  return storeVersion(db, user, { name: input.name, kind: input.kind, members: input.members, options: input.options });
}

export async function changeStudy(db: Knex, user: SignedInUser, id: number, change: ChangeStudy) {
  const cur = await getStudy(db, user.labId, id);
  if (!cur) throw new AppError({ code: "not_found", message: `There is no study ${id} in this lab.` });
  const versions = await listStudyVersions(db, user.labId, cur.record_id!);
  if (versions.at(-1)!.id !== cur.id) throw new AppError({ code: "conflict", message: `Version ${cur.version} is not the newest; open version ${versions.at(-1)!.version}.` });
  const members =
    change.members ??
    cur.members.map(({ fitId, temperature_c, temperature_reason, excess_mol_l }) => ({ fitId, temperature_c, temperature_reason, excess_mol_l }));
  return storeVersion(db, user, {
    name: change.name ?? cur.name,
    kind: cur.kind as "temperature" | "excess",
    members,
    options: change.options ?? cur.options,
    previous: { id: cur.id, record_id: cur.record_id!, version: cur.version },
    reason: change.reason,
  });
}

/** A study version's results: the two-stage numbers, and for temperature studies all curves fitted together. */
export type StudyResults = ReturnType<typeof computeStudy> & { global?: StudyGlobal };

export async function getStudyRecord(db: Knex, labId: number, id: number) {
  const s = await getStudy(db, labId, id);
  if (!s) throw new AppError({ code: "not_found", message: `There is no study ${id} in this lab.` });
  const versions = await listStudyVersions(db, labId, s.record_id!);
  return {
    id: s.id,
    record_id: s.record_id!,
    version: s.version,
    name: s.name,
    kind: s.kind as "temperature" | "excess",
    members: s.members,
    options: s.options,
    results: s.results,
    engine_version: s.engine_version,
    content_hash: s.content_hash,
    reason: s.reason,
    author: s.author_name,
    author_id: s.author_id,
    created_at: s.created_at,
    versions: versions.map((v) => ({ id: v.id, version: v.version, reason: v.reason, author: v.author_name, created_at: v.created_at })),
    newest_id: versions.at(-1)!.id,
  };
}
export type StudyRecord = Awaited<ReturnType<typeof getStudyRecord>>;

export async function listStudies(db: Knex, labId: number) {
  return (await listLatestStudies(db, labId)).map((s) => {
    const r = s.results;
    return { id: s.id, record_id: s.record_id, version: s.version, name: s.name, kind: s.kind, members: s.members, ea: "ea" in r ? r.ea : null, k2: "k2" in r ? r.k2 : null, created_at: s.created_at, author: s.author_name };
  });
}

export async function studyCsv(db: Knex, labId: number, id: number) {
  const s = await getStudyRecord(db, labId, id);
  const lines = [
    `# ${csvCell(s.name)} v${s.version}; engine ${s.engine_version}; content hash ${s.content_hash}`,
    "fit,fit_version,run,series,temperature_c,temperature_reason,k_per_s,se_k_per_s",
    ...s.members.map((m) => [m.fit_title, m.fit_version, m.run_name, m.series_name, m.temperature_used_c, m.temperature_reason ?? "", m.k, m.se].map(csvCell).join(",")),
  ];
  const r = s.results as { ea?: { value: number; se: number | null; ci95?: [number, number] | null }; lnA?: { value: number; se: number | null }; eyring?: { dH: { value: number; se: number | null }; dS: { value: number; se: number | null } } };
  if (r.ea) {
    lines.push("", "result,value,se,ci95_low,ci95_high,unit");
    lines.push(["Ea", r.ea.value, r.ea.se, r.ea.ci95?.[0], r.ea.ci95?.[1], "J/mol"].map(csvCell).join(","));
    lines.push(["lnA", r.lnA?.value, r.lnA?.se, "", "", "ln(1/s)"].map(csvCell).join(","));
    lines.push(["dH", r.eyring?.dH.value, r.eyring?.dH.se, "", "", "J/mol"].map(csvCell).join(","));
    lines.push(["dS", r.eyring?.dS.value, r.eyring?.dS.se, "", "", "J/(mol K)"].map(csvCell).join(","));
  }
  return { name: `study-${s.record_id}-v${s.version}.csv`, text: lines.join("\n") + "\n" };
}
