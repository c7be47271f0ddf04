// Fit records: the server re-runs every saved fit with the engine, stores options, results, engine version and a
// content hash; versions are immutable and chained; every save is an audit event.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { getFit, insertFitVersion, latestVersion, listLatestFits, listVersions } from "@/db/queries/fits";
import { recordAudit } from "@/lib/audit";
import { canonicalJson } from "./canonical";
import { AppError } from "@/lib/errors";
import { claimNextVersion, writeVersion } from "@/lib/records";
import { can } from "@/lib/permissions";
import { getRun } from "@/db/queries/runs";
import { ENGINE_VERSION, PRIMARY_MODEL, fitUnits, parameterUnit, evaluateCriteria, type UnitContext, type CriteriaEvaluation, type SeriesFitOutcome } from "@/lib/kinetics";
import { runJob } from "@/lib/jobs/pool";
import { calibrationConversion, getCalibration, methodForRun } from "@/lib/methods";
import { readSeries } from "@/lib/runs";
import type { FitOptions, SaveFitInput } from "@/lib/schemas/fits";
import type { SignedInUser } from "@/lib/auth/sign-in";

export { canonicalJson };

const sha = (s: string | Buffer) => createHash("sha256").update(s).digest("hex");

/** A series' data hash: SHA-256 of its stored time and value arrays. Saving and verifying both use it. */
export function seriesDataSha(tF64: Uint8Array, yF64: Uint8Array): string {
  return sha(Buffer.concat([tF64, yF64]));
}

/** A fit version's content hash over its data hash, options, results and engine. Saving and verifying both use it. */
export function fitContentHash(c: { data_sha256: string; options: unknown; results: unknown; engine: string }): string {
  return sha(canonicalJson({ data_sha256: c.data_sha256, options: c.options, results: c.results, engine: c.engine }));
}

/** A fit of a run with a method: the method version that judged it and the verdict per criterion. */
export interface MethodEvaluation extends CriteriaEvaluation {
  method: { id: number; record_id: number; version: number; name: string; content_hash: string };
}

export type StoredResults = Omit<SeriesFitOutcome, "curves" | "included" | "linearized_view"> & { excluded_indices: number[]; method_evaluation?: MethodEvaluation };

function storedResults(out: SeriesFitOutcome): StoredResults {
  const { curves: _c, included, linearized_view: _v, ...rest } = out;
  return { ...rest, excluded_indices: included.flatMap((inc, i) => (inc ? [] : [i])) };
}

/** The units of a record's values (AU, mol L⁻¹ or the calibration's unit; times in s). */
export function recordUnits(results: Pick<StoredResults, "quantity">, options: Pick<FitOptions, "conversion">): UnitContext {
  return fitUnits(results.quantity, options.conversion);
}

/** A parameter's unit on a record ("" for none known, as for own formulas). */
export function recordParameterUnit(model: string, param: string, units: UnitContext): string {
  return parameterUnit(model, param, units) ?? "";
}

export function primaryOf(results: StoredResults) {
  const m = results.models.find((x) => x.model === PRIMARY_MODEL) ?? results.models[0];
  const k = m?.result.parameters.find((p) => p.name === "k");
  return { model: m?.model ?? "none", k: k?.value ?? null, se: k?.se ?? null };
}

export async function computeFit(db: Knex, labId: number, runId: number, seriesId: number, options: FitOptions) {
  const { row, t, y } = await readSeries(db, labId, runId, seriesId);
  // The fit is CPU work: it runs on a worker thread, with the pool's time limit.
  const outcome = await runJob("fit-series", { t, y, options });
  const dataSha = seriesDataSha(row.t_f64, row.y_f64);
  return { row, t, y, outcome, dataSha };
}

/** Own formulas are the method developer's permission; anyone who may fit can use a formula the run's method defines. */
export function assertFormulaAllowed(user: SignedInUser, options: FitOptions, methodModels: ReadonlyArray<{ formula: string }>): void {
  const formula = options.formula?.trim();
  if (!formula || !options.models.includes("formula") || can({ userId: user.userId, role: user.role }, "model:custom")) return;
  if (methodModels.some((m) => m.formula.trim() === formula)) return;
  throw new AppError({ code: "forbidden", message: "Fitting an own formula is open to method developers; use a formula from the run's method, or ask a method developer to add yours to it." });
}

export async function saveFit(db: Knex, user: SignedInUser, input: SaveFitInput, now = new Date()) {
  let previous = null;
  if (input.previousId) {
    const p = await getFit(db, user.labId, input.previousId);
    if (!p) throw new AppError({ code: "not_found", message: `There is no fit ${input.previousId} in this lab.` });
    const latest = await latestVersion(db, user.labId, p.record_id!);
    if (latest && latest.id !== p.id) throw new AppError({ code: "conflict", message: `Version ${p.version} is not the newest (version ${latest.version} is); open the newest before changing it.` });
    if (p.series_id !== input.seriesId || p.run_id !== input.runId) throw new AppError({ code: "unprocessable", message: "A new version must fit the same series as the record it changes." });
    if (!input.reason) throw new AppError({ code: "unprocessable", message: "Say why this version changes the record (a reason is required for every change).", issues: [{ path: "reason", message: "Required for a new version." }] });
    previous = p;
  }
  const run = await getRun(db, user.labId, input.runId);
  const method = await methodForRun(db, user.labId, run?.method_record_id ?? null);
  assertFormulaAllowed(user, input.options, method?.definition.custom_models ?? []);
  const { outcome, dataSha } = await computeFit(db, user.labId, input.runId, input.seriesId, input.options);
  if ((input.options.exclusions ?? []).some((e) => e.index >= outcome.included.length))
    throw new AppError({ code: "unprocessable", message: "An excluded point is beyond the end of the series." });
  const results = storedResults(outcome);
  const conv = input.options.conversion;
  if (conv?.kind === "calibration") {
    const cal = await getCalibration(db, user.labId, conv.calibrationId);
    const expected = calibrationConversion(cal);
    if (expected.slope !== conv.slope || expected.intercept !== conv.intercept || expected.seSlope !== conv.seSlope || expected.unit !== conv.unit)
      throw new AppError({ code: "unprocessable", message: `The conversion's numbers do not match calibration ${cal.id} (${cal.name}) as stored; reload the page.` });
  }
  if (method) {
    const evaluation = evaluateCriteria(outcome, method.definition.criteria, method.definition.models);
    results.method_evaluation = { method: { id: method.id, record_id: method.record_id, version: method.version, name: method.name, content_hash: method.content_hash }, ...evaluation };
  }
  const contentHash = fitContentHash({ data_sha256: dataSha, options: input.options, results, engine: ENGINE_VERSION });
  if (previous && previous.content_hash === contentHash) {
    return { id: previous.id, record_id: previous.record_id!, version: previous.version, content_hash: contentHash, unchanged: true };
  }
  const primary = primaryOf(results);
  return writeVersion(db, async (trx) => {
    const version = await claimNextVersion(trx, "fits", user.labId, previous ? { id: previous.id, record_id: previous.record_id!, version: previous.version } : null);
    const id = await insertFitVersion(trx, {
      lab_id: user.labId,
      run_id: input.runId,
      series_id: input.seriesId,
      record_id: previous ? previous.record_id : null,
      version,
      previous_id: previous ? previous.id : null,
      title: input.title ?? previous?.title ?? `Fit of ${input.seriesId}`,
      primary_model: primary.model,
      k_value: primary.k,
      k_se: primary.se,
      criteria_failed: results.method_evaluation ? results.method_evaluation.failed : null,
      options: canonicalJson(input.options),
      results: JSON.stringify(results),
      engine_version: ENGINE_VERSION,
      data_sha256: dataSha,
      content_hash: contentHash,
      reason: input.reason ?? null,
      author_id: user.userId,
      created_at: now.toISOString(),
    });
    const recordId = previous ? previous.record_id! : id;
    await recordAudit(trx, {
      labId: user.labId,
      actorUserId: user.userId,
      action: previous ? "fit.version_saved" : "fit.created",
      objectType: "fit",
      objectId: recordId,
      objectVersion: version,
      oldValues: previous ? { version: previous.version, content_hash: previous.content_hash, options: previous.options } : undefined,
      newValues: {
        version,
        content_hash: contentHash,
        options: input.options,
        k: primary.k,
        k_se: primary.se,
        ...(results.method_evaluation ? { method: results.method_evaluation.method, criteria_failed: results.method_evaluation.failed } : {}),
      },
      reason: input.reason ?? null,
    });
    return { id, record_id: recordId, version, content_hash: contentHash, unchanged: false };
  });
}

function view(row: NonNullable<Awaited<ReturnType<typeof getFit>>>) {
  return {
    id: row.id,
    record_id: row.record_id,
    version: row.version,
    previous_id: row.previous_id,
    title: row.title,
    run: { id: row.run_id, name: row.run_name },
    series: { id: row.series_id, name: row.series_name },
    primary: { model: row.primary_model, k: row.k_value, k_se: row.k_se },
    options: row.options,
    results: row.results,
    engine_version: row.engine_version,
    data_sha256: row.data_sha256,
    content_hash: row.content_hash,
    reason: row.reason,
    author: row.author_name,
    author_id: row.author_id,
    created_at: row.created_at,
  };
}
export type FitRecordView = ReturnType<typeof view>;

export async function getFitRecord(db: Knex, labId: number, id: number): Promise<FitRecordView> {
  const row = await getFit(db, labId, id);
  if (!row) throw new AppError({ code: "not_found", message: `There is no fit ${id} in this lab.` });
  return view(row);
}

export async function fitVersions(db: Knex, labId: number, id: number) {
  const row = await getFit(db, labId, id);
  if (!row) throw new AppError({ code: "not_found", message: `There is no fit ${id} in this lab.` });
  return versionsOfRecord(db, labId, row.record_id!);
}

/** Every version of a fit record, each with what changed from the one before (for callers that hold the record). */
export async function versionsOfRecord(db: Knex, labId: number, recordId: number) {
  const versions = await listVersions(db, labId, recordId);
  return versions.map((v, i) => ({
    id: v.id,
    version: v.version,
    created_at: v.created_at,
    author: v.author_name,
    reason: v.reason,
    content_hash: v.content_hash,
    k: v.k_value,
    k_se: v.k_se,
    /** k's unit under this version's primary model and conversion. */
    k_unit: recordParameterUnit(v.primary_model, "k", fitUnits(parseResultsQuantity(v.results), v.options.conversion)),
    changes: i === 0 ? ["first version"] : describeChanges(versions[i - 1]!.options, v.options),
  }));
}

function parseResultsQuantity(results: StoredResults): "absorbance" | "concentration" {
  return results.quantity === "concentration" ? "concentration" : "absorbance";
}

/** What changed between two versions' options, in plain words. */
export function describeChanges(a: FitOptions, b: FitOptions): string[] {
  const out: string[] = [];
  const ea = new Map((a.exclusions ?? []).map((e) => [e.index, e.reason]));
  const eb = new Map((b.exclusions ?? []).map((e) => [e.index, e.reason]));
  for (const [i, r] of eb) if (!ea.has(i)) out.push(`point ${i + 1} excluded: “${r}”`);
  for (const [i] of ea) if (!eb.has(i)) out.push(`point ${i + 1} restored`);
  const keys = new Set([...Object.keys(a.fixed ?? {}), ...Object.keys(b.fixed ?? {})]);
  for (const k of keys) {
    const x = a.fixed?.[k],
      y = b.fixed?.[k];
    if (x !== y) out.push(y === undefined ? `${k} no longer fixed` : x === undefined ? `${k} fixed at ${y}` : `${k} fixed at ${y} (was ${x})`);
  }
  if (canonicalJson(a.window ?? {}) !== canonicalJson(b.window ?? {})) out.push(`fitting window ${b.window?.from ?? "start"}–${b.window?.to ?? "end"} s`);
  if (canonicalJson(a.models) !== canonicalJson(b.models)) out.push(`models: ${b.models.join(", ")}`);
  if (canonicalJson(a.conversion ?? null) !== canonicalJson(b.conversion ?? null)) out.push(!b.conversion ? "no conversion" : b.conversion.kind === "beer-lambert" ? `converted by Beer–Lambert (ε ${b.conversion.epsilon})` : `converted by calibration ${b.conversion.calibrationId}`);
  if (canonicalJson(a.starts ?? {}) !== canonicalJson(b.starts ?? {})) out.push("start values changed");
  if ((a.interval ?? null) !== (b.interval ?? null)) out.push(`interval ${b.interval ?? "none"} s`);
  return out.length ? out : ["no change to the options"];
}

export async function listFits(db: Knex, labId: number, q: { runId?: number; q?: string; sort: "created_at" | "title" | "k_value" | "version"; dir: "asc" | "desc"; page: number; pageSize: number }) {
  const { rows, total } = await listLatestFits(db, { labId, runId: q.runId, q: q.q, sort: q.sort, dir: q.dir, limit: q.pageSize, offset: (q.page - 1) * q.pageSize });
  return { fits: rows, total, page: q.page, pageSize: q.pageSize };
}

/** Spreadsheet programs run cells that begin with = + − @ (or tab/CR) as formulas: such text cells get a leading '. */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  let s = String(v);
  if (/^[=+\-−@\t\r]/.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export async function fitDataCsv(db: Knex, labId: number, id: number): Promise<{ name: string; text: string }> {
  const rec = await getFitRecord(db, labId, id);
  const { t, y, outcome } = await computeFit(db, labId, rec.run.id, rec.series.id, rec.options);
  const curveModels = rec.options.models.filter((m) => outcome.curves[m] && outcome.curves[m]!.t.length > 0);
  const reasons = new Map((rec.options.exclusions ?? []).map((e) => [e.index, e.reason]));
  const lines = [
    `# ${csvCell(rec.title)} v${rec.version}; run ${csvCell(rec.run.name)}; series ${csvCell(rec.series.name)}; engine ${rec.engine_version}; content hash ${rec.content_hash}`,
    ["t_s", "y", "included", "exclusion_reason", ...curveModels.flatMap((m) => [`fitted_${m}`, `residual_${m}`])].join(","),
  ];
  const pos = new Map<string, number>();
  for (let i = 0; i < t.length; i++) {
    const inc = outcome.included[i]!;
    const cells: unknown[] = [t[i], y[i], inc ? 1 : 0, reasons.get(i) ?? ""];
    for (const m of curveModels) {
      if (inc) {
        const p = pos.get(m) ?? 0;
        cells.push(outcome.curves[m]!.fitted[p], outcome.curves[m]!.residuals[p]);
        pos.set(m, p + 1);
      } else cells.push("", "");
    }
    lines.push(cells.map(csvCell).join(","));
  }
  return { name: `fit-${rec.record_id}-v${rec.version}-data.csv`, text: lines.join("\n") + "\n" };
}

export async function fitParametersCsv(db: Knex, labId: number, id: number): Promise<{ name: string; text: string }> {
  const rec = await getFitRecord(db, labId, id);
  const lines = [
    `# ${csvCell(rec.title)} v${rec.version}; engine ${rec.engine_version}; content hash ${rec.content_hash}; times in s, rate constants per second`,
    "model,parameter,unit,value,se,ci95_low,ci95_high,fixed,n,dof,ssr,r2,aicc,akaike_weight,runs,durbin_watson,converged,message",
  ];
  const units = recordUnits(rec.results, rec.options);
  for (const m of rec.results.models)
    for (const p of m.result.parameters)
      lines.push(
        [m.model, p.name, recordParameterUnit(m.model, p.name, units), p.value, p.se, p.ci95?.[0], p.ci95?.[1], p.fixed ? 1 : 0, m.result.n, m.result.dof, m.result.ssr, m.result.r2, m.result.aicc, m.akaikeWeight, m.result.runs, m.result.durbin_watson, m.result.converged ? 1 : 0, m.result.message]
          .map(csvCell)
          .join(","),
      );
  return { name: `fit-${rec.record_id}-v${rec.version}-parameters.csv`, text: lines.join("\n") + "\n" };
}
