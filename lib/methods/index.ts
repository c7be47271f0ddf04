// Methods and calibrations. A method is a versioned, audited template saying how a run must be evaluated (wavelength,
// ε or a calibration, path length, blank, models, weighting, window, custom models, acceptance criteria); a calibration
// is an immutable record of standards and the line through them, with LOD/LOQ. Fits of a run that has a method are
// evaluated against the method's newest version when they are saved.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import {
  getCalibrationRow,
  getMethodRow,
  insertCalibration,
  insertMethodVersion,
  listCalibrationRows,
  listLatestMethodRows,
  listMethodVersionRows,
  methodChoices,
  newestMethodVersion,
  setRunMethod,
} from "@/db/queries/methods";
import { getRun } from "@/db/queries/runs";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { claimNextVersion, writeVersion } from "@/lib/records";
import { canonicalJson } from "@/lib/fits/canonical";
import { calibrate, compileFormula, ENGINE_VERSION, fitKinetics, FormulaError, type Calibration, type Conversion } from "@/lib/kinetics";
import type { CreateCalibration, CustomModel, ListQueryInput, MethodDefinition, MethodForRun } from "@/lib/schemas/methods";

const sha = (s: string) => createHash("sha256").update(s).digest("hex");

// ---------- calibrations ----------

export interface CalibrationResults {
  slope: number;
  se_slope: number;
  intercept: number;
  se_intercept: number | null;
  residual_sd: number;
  r2: number;
  n: number;
  levels: number;
  range: [number, number];
  sigma: number;
  sigma_source: Calibration["sigmaSource"];
  lod: number;
  loq: number;
  residuals: number[];
  linearity: Calibration["linearity"];
  /** The line's own numbers needed for inverse prediction with its SE (mean x, Σw, Sxx). */
  x_mean: number;
  sum_w: number;
  sxx: number;
  warnings: string[];
}

export function computeCalibration(input: CreateCalibration): CalibrationResults {
  try {
    const c = calibrate(
      input.standards.map((s) => s.concentration),
      input.standards.map((s) => s.absorbance),
      { throughOrigin: input.through_origin, weighting: input.weighting, sigma: input.sigma, blankSd: input.blank_sd ?? undefined },
    );
    if (!(c.slope > 0)) throw new AppError({ code: "unprocessable", message: `The calibration slope is ${c.slope.toPrecision(4)}: absorbance must rise with concentration. Check the columns.` });
    return {
      slope: c.slope,
      se_slope: c.seSlope,
      intercept: c.intercept,
      se_intercept: c.seIntercept,
      residual_sd: c.residualSd,
      r2: c.r2,
      n: c.n,
      levels: c.levels,
      range: c.range,
      sigma: c.sigma,
      sigma_source: c.sigmaSource,
      lod: c.lod,
      loq: c.loq,
      residuals: c.fit.residuals,
      linearity: c.linearity,
      x_mean: c.fit.xMean,
      sum_w: c.fit.sumW,
      sxx: c.fit.sxx,
      warnings: c.warnings,
    };
  } catch (e) {
    if (e instanceof RangeError || (e instanceof Error && e.name === "RegressionError")) throw new AppError({ code: "unprocessable", message: e.message });
    throw e;
  }
}

export async function createCalibration(db: Knex, user: SignedInUser, input: CreateCalibration) {
  const results = computeCalibration(input);
  const options = { through_origin: input.through_origin, weighting: input.weighting, sigma: input.sigma, blank_sd: input.blank_sd };
  const contentHash = sha(canonicalJson({ standards: input.standards, options, results, engine: ENGINE_VERSION }));
  return db.transaction(async (trx) => {
    const id = await insertCalibration(trx, {
      lab_id: user.labId,
      name: input.name,
      analyte: input.analyte,
      concentration_unit: input.concentration_unit,
      wavelength_nm: input.wavelength_nm,
      standards: JSON.stringify(input.standards),
      options: JSON.stringify(options),
      results: JSON.stringify(results),
      slope: results.slope,
      lod: results.lod,
      loq: results.loq,
      engine_version: ENGINE_VERSION,
      content_hash: contentHash,
      author_id: user.userId,
      created_at: new Date().toISOString(),
    });
    await recordAudit(trx, {
      labId: user.labId,
      actorUserId: user.userId,
      action: "calibration.created",
      objectType: "calibration",
      objectId: id,
      objectVersion: 1,
      newValues: { name: input.name, standards: input.standards.length, options, slope: results.slope, intercept: results.intercept, lod: results.lod, loq: results.loq, content_hash: contentHash },
    });
    return { id, content_hash: contentHash, results };
  });
}

export async function getCalibration(db: Knex, labId: number, id: number) {
  const row = await getCalibrationRow(db, labId, id);
  if (!row) throw new AppError({ code: "not_found", message: `There is no calibration ${id} in this lab.` });
  return {
    id: row.id,
    name: row.name,
    analyte: row.analyte,
    concentration_unit: row.concentration_unit,
    wavelength_nm: row.wavelength_nm,
    standards: row.standards,
    options: row.options,
    results: row.results,
    engine_version: row.engine_version,
    content_hash: row.content_hash,
    author: row.author_name,
    created_at: row.created_at,
  };
}
export type CalibrationRecord = Awaited<ReturnType<typeof getCalibration>>;

export async function listCalibrations(db: Knex, labId: number, q: ListQueryInput) {
  const { rows, total } = await listCalibrationRows(db, labId, q);
  return {
    rows: rows.map((r) => {
      const res = r.results;
      return { id: r.id, name: r.name, analyte: r.analyte, unit: r.concentration_unit, wavelength_nm: r.wavelength_nm, slope: r.slope, r2: res.r2, n: res.n, lod: r.lod, loq: r.loq, linear: res.linearity.linear, author: r.author_name, created_at: r.created_at };
    }),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

/** A calibration as a fit option: the numbers the engine needs to convert readings, checked on the server at save. */
export function calibrationConversion(c: CalibrationRecord, blank: number | null = null): Extract<Conversion, { kind: "calibration" }> {
  return { kind: "calibration", calibrationId: c.id, slope: c.results.slope, seSlope: c.results.se_slope, intercept: c.results.intercept, unit: c.concentration_unit, ...(blank !== null ? { blank } : {}) };
}

// ---------- methods ----------

/** A custom model is accepted only if its formula reads and a test fit recovers it from its own curve. */
export function checkCustomModel(m: CustomModel): { params: string[] } {
  let compiled;
  try {
    compiled = compileFormula(m.formula);
  } catch (e) {
    if (e instanceof FormulaError) throw new AppError({ code: "unprocessable", message: `Custom model "${m.name}": ${e.message}` });
    throw e;
  }
  const truth = compiled.params.map((p) => m.starts[p] ?? 1);
  const t = Float64Array.from({ length: 41 }, (_, i) => i * 25);
  const y = new Float64Array(t.length);
  compiled.evaluate(t, truth, y);
  if (!y.every(Number.isFinite)) throw new AppError({ code: "unprocessable", message: `Custom model "${m.name}": the formula gives non-finite values over 0–1000 s at its start values; give start values that describe a real curve.` });
  const start = Object.fromEntries(compiled.params.map((p, i) => [p, truth[i]! * 1.1 || 0.1]));
  const r = fitKinetics(t, y, { formula: m.formula, start });
  if (!r.converged) throw new AppError({ code: "unprocessable", message: `Custom model "${m.name}": a test fit of the formula to its own curve did not converge (${r.message}).` });
  return { params: compiled.params };
}

async function checkDefinition(db: Knex, labId: number, d: MethodDefinition) {
  for (const m of d.custom_models) checkCustomModel(m);
  if (d.concentration.kind === "calibration") {
    const c = await getCalibrationRow(db, labId, d.concentration.calibration_id);
    if (!c) throw new AppError({ code: "unprocessable", message: `There is no calibration ${d.concentration.calibration_id} in this lab.`, issues: [{ path: "concentration.calibration_id", message: "Unknown calibration." }] });
  }
}

async function storeMethodVersion(db: Knex, user: SignedInUser, d: MethodDefinition, previous: { id: number; record_id: number; version: number; definition: MethodDefinition } | null, reason: string | null) {
  await checkDefinition(db, user.labId, d);
  const definition = canonicalJson(d);
  if (previous && canonicalJson(previous.definition) === definition) throw new AppError({ code: "conflict", message: "Nothing changed: the newest version already holds this definition." });
  const contentHash = sha(definition);
  return writeVersion(db, async (trx) => {
    const version = await claimNextVersion(trx, "methods", user.labId, previous);
    const id = await insertMethodVersion(trx, {
      lab_id: user.labId,
      record_id: previous ? previous.record_id : null,
      version,
      previous_id: previous?.id ?? null,
      name: d.name,
      analyte: d.analyte,
      definition,
      calibration_id: d.concentration.kind === "calibration" ? d.concentration.calibration_id : null,
      content_hash: contentHash,
      reason,
      author_id: user.userId,
      created_at: new Date().toISOString(),
    });
    const recordId = previous ? previous.record_id : id;
    await recordAudit(trx, {
      labId: user.labId,
      actorUserId: user.userId,
      action: previous ? "method.version_saved" : "method.created",
      objectType: "method",
      objectId: recordId,
      objectVersion: version,
      oldValues: previous ? previous.definition : null,
      newValues: { ...d, content_hash: contentHash },
      reason,
    });
    return { id, record_id: recordId, version, content_hash: contentHash };
  });
}

export async function createMethod(db: Knex, user: SignedInUser, d: MethodDefinition) {
  return storeMethodVersion(db, user, d, null, null);
}

export async function newMethodVersion(db: Knex, user: SignedInUser, id: number, d: MethodDefinition, reason: string) {
  const cur = await getMethodRow(db, user.labId, id);
  if (!cur) throw new AppError({ code: "not_found", message: `There is no method ${id} in this lab.` });
  const newest = (await newestMethodVersion(db, user.labId, cur.record_id!))!;
  if (newest.id !== cur.id) throw new AppError({ code: "conflict", message: `Version ${cur.version} is not the newest; open version ${newest.version}.` });
  return storeMethodVersion(db, user, d, { id: cur.id, record_id: cur.record_id!, version: cur.version, definition: cur.definition }, reason);
}

export interface MethodVersionView {
  id: number;
  record_id: number;
  version: number;
  name: string;
  analyte: string;
  definition: MethodDefinition;
  calibration: CalibrationRecord | null;
  content_hash: string;
  reason: string | null;
  author: string | null;
  created_at: string;
}

async function viewOf(db: Knex, labId: number, row: { id: number; record_id: number | null; version: number; name: string; analyte: string; definition: MethodDefinition; calibration_id: number | null; content_hash: string; reason: string | null; created_at: string }, author: string | null): Promise<MethodVersionView> {
  return {
    id: row.id,
    record_id: row.record_id!,
    version: row.version,
    name: row.name,
    analyte: row.analyte,
    definition: row.definition,
    calibration: row.calibration_id ? await getCalibration(db, labId, row.calibration_id) : null,
    content_hash: row.content_hash,
    reason: row.reason,
    author,
    created_at: row.created_at,
  };
}

export async function getMethod(db: Knex, labId: number, id: number) {
  const row = await getMethodRow(db, labId, id);
  if (!row) throw new AppError({ code: "not_found", message: `There is no method ${id} in this lab.` });
  const versions = await listMethodVersionRows(db, labId, row.record_id!);
  return { ...(await viewOf(db, labId, row, row.author_name)), versions: versions.map((v) => ({ id: v.id, version: v.version, reason: v.reason, author: v.author_name, created_at: v.created_at })), newest_id: versions.at(-1)!.id };
}
export type MethodRecord = Awaited<ReturnType<typeof getMethod>>;

/** The version that applies to a run now: the newest version of the run's method record. */
export async function methodForRun(db: Knex, labId: number, methodRecordId: number | null): Promise<MethodVersionView | null> {
  if (!methodRecordId) return null;
  const row = await newestMethodVersion(db, labId, methodRecordId);
  return row ? viewOf(db, labId, row, null) : null;
}

export async function listMethods(db: Knex, labId: number, q: ListQueryInput) {
  const { rows, total } = await listLatestMethodRows(db, labId, q);
  return {
    rows: rows.map((r) => {
      const d = r.definition;
      return { id: r.id, record_id: r.record_id!, version: r.version, name: r.name, analyte: r.analyte, wavelength_nm: d.wavelength_nm, models: d.models, criteria: d.criteria.length, concentration: d.concentration.kind, author: r.author_name, created_at: r.created_at };
    }),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

export { methodChoices };

/** Assigns (or clears) a run's method; audited with the reason. Fits saved before keep their own evaluation. */
/** Wavelengths further apart than this are a mismatch (a method validated at one wavelength applied at another). */
export const WAVELENGTH_TOLERANCE_NM = 1;

export function wavelengthMismatch(methodNm: number | null | undefined, runNm: number | null | undefined): { method_nm: number; run_nm: number } | null {
  if (methodNm === null || methodNm === undefined || runNm === null || runNm === undefined) return null;
  return Math.abs(methodNm - runNm) > WAVELENGTH_TOLERANCE_NM ? { method_nm: methodNm, run_nm: runNm } : null;
}

/** The run's method against the run's wavelength, for the caution on every fit of the run. */
export async function runWavelengthMismatch(db: Knex, labId: number, runId: number): Promise<{ method: string; method_nm: number; run_nm: number } | null> {
  const run = await getRun(db, labId, runId);
  if (!run?.method_record_id) return null;
  const m = await newestMethodVersion(db, labId, run.method_record_id);
  const mm = wavelengthMismatch(m?.definition.wavelength_nm, run.wavelength_nm);
  return mm && m ? { method: m.name, ...mm } : null;
}

export async function assignRunMethod(db: Knex, user: SignedInUser, runId: number, methodRecordId: number | null, reason: string, wavelengthReason?: string) {
  // The run, the method's newest version and the wavelength guard are read inside the transaction that writes, so the
  // check holds for exactly the versions the assignment records.
  return db.transaction(async (trx) => {
    const run = await getRun(trx, user.labId, runId);
    if (!run) throw new AppError({ code: "not_found", message: `There is no run ${runId} in this lab.` });
    const method = methodRecordId ? await newestMethodVersion(trx, user.labId, methodRecordId) : null;
    if (methodRecordId && !method) throw new AppError({ code: "unprocessable", message: `There is no method ${methodRecordId} in this lab.` });
    const mismatch = wavelengthMismatch(method?.definition.wavelength_nm, run.wavelength_nm);
    if (mismatch && !wavelengthReason)
      throw new AppError({
        code: "unprocessable",
        message: `${method!.name} is a method for ${mismatch.method_nm} nm; this run was measured at ${mismatch.run_nm} nm. Its absorptivity or calibration and its criteria may not hold here: say why the method applies anyway, or choose another.`,
        issues: [{ path: "wavelengthReason", message: "Required when the wavelengths differ." }],
      });
    await setRunMethod(trx, user.labId, runId, method ? method.record_id : null, method ? method.name : null);
    await recordAudit(trx, {
      labId: user.labId,
      actorUserId: user.userId,
      action: "run.method_assigned",
      objectType: "run",
      objectId: runId,
      oldValues: { method_record_id: run.method_record_id, method: run.method },
      newValues: { method_record_id: method?.record_id ?? null, method: method?.name ?? null, method_version: method?.version ?? null, ...(mismatch ? { wavelength_mismatch: { ...mismatch, reason: wavelengthReason } } : {}) },
      reason,
    });
    return { ok: true as const, method: method ? { record_id: method.record_id, name: method.name, version: method.version } : null };
  });
}

/** The run's method as the fitting page starts from it: options, criteria, and the conversion it implies. */
export async function methodForWorkspace(db: Knex, labId: number, methodRecordId: number | null): Promise<MethodForRun | null> {
  const m = await methodForRun(db, labId, methodRecordId);
  if (!m) return null;
  const d = m.definition;
  const blank = d.blank.kind === "value" ? d.blank.value : null;
  const conversion: Conversion | null =
    d.concentration.kind === "beer-lambert"
      ? { kind: "beer-lambert", epsilon: d.concentration.epsilon, pathLengthCm: d.path_length_cm, ...(blank !== null ? { blank } : {}) }
      : d.concentration.kind === "calibration" && m.calibration
        ? calibrationConversion(m.calibration, blank)
        : null;
  return {
    id: m.id,
    version: m.version,
    name: m.name,
    models: d.models,
    criteria: d.criteria,
    window: d.window,
    weighting: d.weighting,
    formula: d.custom_models[0]?.formula ?? null,
    starts: d.custom_models[0]?.starts ?? {},
    pathLengthCm: d.path_length_cm,
    conversion,
  };
}
