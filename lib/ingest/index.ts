// Ingest: the raw file's SHA-256, the parser's choice, the column mapping, and the one transaction that stores raw file,
// run, series and audit event together (or nothing at all).
import type { Knex } from "knex";
import { findRawFileBySha, findRunsOfRawFile, insertRawFile, insertRun, insertSeries, listSeriesOfRun, ownedF64 } from "@/db/queries/runs";
import { getLabSettingsRow } from "@/db/queries/admin";
import { newestMethodVersion } from "@/db/queries/methods";
import { recordAudit } from "@/lib/audit";
import { sha256Hex, storeRawBytes } from "@/lib/storage/raw-store";
import { AppError } from "@/lib/errors";
import type { RunMapping, UploadPreview } from "@/lib/schemas/runs";
import { PARSE_LIMITS } from "@/parsers/limits";
import { runJob } from "@/lib/jobs/pool";
import { ParseError } from "@/parsers";
import type { PackedExport, PackedSeries } from "@/lib/jobs/work";

// The hash raw files are keyed by, for callers that ingest.
export { sha256Hex };

/** Limits stated on the upload page: the size here, the rest while the parsers read (parsers/limits.ts), again after. */
export const INGEST_LIMITS = { maxBytes: 50 * 1024 * 1024, maxPoints: PARSE_LIMITS.maxPoints, maxChannels: PARSE_LIMITS.maxChannels } as const;


function refuse(fileName: string, e: ParseError): AppError {
  return new AppError({ code: "unprocessable", message: `${fileName}: ${e.message}`, line: e.line });
}

export function checkSize(fileName: string, size: number, maxBytes: number = INGEST_LIMITS.maxBytes): void {
  if (size > maxBytes)
    throw new AppError({ code: "payload_too_large", message: `${fileName} is ${(size / 1048576).toFixed(1)} MB; the limit is ${maxBytes / 1048576} MB per file.` });
  if (size === 0) throw new AppError({ code: "unprocessable", message: `${fileName}: The file is empty.` });
}

/**
 * Parses and checks an export; refused input becomes a 422 naming the file and the line. Its size has been checked
 * against the lab's limit (never above the server's) by the caller, before any other work.
 */
async function readExport(bytes: Uint8Array, fileName: string, mapping: Pick<RunMapping, "parser" | "timeColumn"> = {}): Promise<PackedExport & { ranking: Array<{ name: string; confidence: number }> }> {
  // Parsing is CPU work: it runs on a worker thread, with the pool's time limit.
  const r = await runJob("parse-export", { bytes, fileName, parser: mapping.parser, timeColumn: mapping.timeColumn });
  if (r.error) throw refuse(fileName, new ParseError(r.error.reason, r.error.line));
  const parsed = r.parsed!;
  if (parsed.series.length > INGEST_LIMITS.maxChannels)
    throw new AppError({ code: "unprocessable", message: `${fileName} has ${parsed.series.length} channels; the limit is ${INGEST_LIMITS.maxChannels}.` });
  const points = parsed.series.reduce((s, x) => s + x.t.length, 0);
  if (points > INGEST_LIMITS.maxPoints)
    throw new AppError({ code: "unprocessable", message: `${fileName} has ${points.toLocaleString("en")} readings; the limit is ${INGEST_LIMITS.maxPoints.toLocaleString("en")}.` });
  return { ...parsed, ranking: r.ranking };
}

export type ReadExport = Awaited<ReturnType<typeof readExport>>;

/**
 * Starts reading an export on the job pool now, for a caller with other work to do meanwhile (the command line opens
 * and migrates its database while the file is parsed), to hand to `ingestExport` as `parsing`. The server's size limit
 * is checked first; the lab's is checked again by `ingestExport` before the result is used.
 */
export function startReadExport(bytes: Uint8Array, fileName: string, mapping: Pick<RunMapping, "parser" | "timeColumn"> = {}): Promise<ReadExport> {
  checkSize(fileName, bytes.length);
  const parsing = readExport(bytes, fileName, mapping);
  parsing.catch(() => {}); // answered where it is awaited; an unused one (the file was stored before) is not an error
  return parsing;
}

/** The lab's upload limit (lab settings), never above the server's own. */
export async function uploadLimitBytes(db: Knex | Knex.Transaction, labId: number): Promise<number> {
  const mb = (await getLabSettingsRow(db, labId))?.upload_limit_mb;
  return Math.min(INGEST_LIMITS.maxBytes, (mb ?? INGEST_LIMITS.maxBytes / 1048576) * 1048576);
}

const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

export async function findExistingRun(db: Knex | Knex.Transaction, labId: number, sha256: string) {
  const raw = await findRawFileBySha(db, labId, sha256);
  if (!raw) return null;
  const runs = await findRunsOfRawFile(db, labId, raw.id);
  return runs[0] ?? null;
}

/** What the upload page shows before anything is stored. */
export async function previewUpload(db: Knex, labId: number, bytes: Uint8Array, fileName: string, mapping: Pick<RunMapping, "parser" | "timeColumn"> = {}): Promise<UploadPreview> {
  checkSize(fileName, bytes.length, await uploadLimitBytes(db, labId));
  const parsed = await readExport(bytes, fileName, mapping);
  const sha256 = sha256Hex(bytes);
  const existing = await findExistingRun(db, labId, sha256);
  const text = new TextDecoder("utf-8", { fatal: false }).decode(bytes.subarray(0, 64 * 1024)).replace(/^\uFEFF/, "");
  const head = text.split(/\r\n|\n|\r/).slice(0, 25).map((t, i) => ({ line: i + 1, text: t.slice(0, 300) }));
  const PREVIEW = 400;
  return {
    sha256,
    name: fileName,
    size: bytes.length,
    parser: parsed.parser,
    parsers: parsed.ranking,
    metadata: parsed.metadata,
    warnings: parsed.warnings,
    columns: parsed.columns ?? [],
    series: parsed.series.map((s) => {
      const stride = Math.max(1, Math.ceil(s.t.length / PREVIEW));
      return {
        name: s.name,
        quantity: s.quantity,
        unit: s.unit,
        points: s.t.length,
        skipped_lines: s.skipped_lines,
        t: Array.from(s.t.filter((_, i) => i % stride === 0)),
        y: Array.from(s.y.filter((_, i) => i % stride === 0)),
        first_t: Array.from(s.t.subarray(0, 8)),
        first_y: Array.from(s.y.subarray(0, 8)),
        wavelength_nm: num(s.metadata?.wavelength_nm),
      };
    }),
    head,
    existing: existing ? { run_id: existing.id, name: existing.name, created_at: existing.created_at } : null,
    suggested: {
      name: fileName.replace(/\.[^.]+$/, ""),
      wavelength_nm: num(parsed.metadata.wavelength_nm),
      path_length_cm: num(parsed.metadata.path_length_cm),
      temperature_c: num(parsed.metadata.temperature_c),
      operator: typeof parsed.metadata.operator === "string" ? parsed.metadata.operator : null,
      sample: typeof parsed.metadata.sample === "string" ? parsed.metadata.sample : null,
    },
  };
}

interface StoredSeries {
  source: string;
  name: string;
  quantity: string;
  unit: string;
  series: PackedSeries;
  processing: Record<string, unknown>;
  t: ArrayLike<number>;
  y: ArrayLike<number>;
}

/** Applies the mapping: chosen channels, their names, and the blank subtracted at equal times. */
export function applyMapping(parsed: PackedExport, mapping: RunMapping, fileName: string): StoredSeries[] {
  const byName = new Map(parsed.series.map((s) => [s.name, s]));
  for (const c of mapping.channels ?? [])
    if (!byName.has(c.source)) throw new AppError({ code: "unprocessable", message: `${fileName}: the mapping names a channel "${c.source}" that the file does not have.` });
  let blank: PackedSeries | undefined;
  if (mapping.blank) {
    blank = byName.get(mapping.blank);
    if (!blank) throw new AppError({ code: "unprocessable", message: `${fileName}: the blank channel "${mapping.blank}" is not in the file.` });
  }
  const blankAt = new Map<number, number>();
  blank?.t.forEach((t, i) => {
    if (!blankAt.has(t)) blankAt.set(t, blank!.y[i]!);
  });
  const chosen = parsed.series.filter((s) => s !== blank && (mapping.channels?.find((c) => c.source === s.name)?.include ?? true));
  if (chosen.length === 0) throw new AppError({ code: "unprocessable", message: `${fileName}: no channel is left to store (all were left out${blank ? " or used as the blank" : ""}).` });
  return chosen.map((s) => {
    const c = mapping.channels?.find((x) => x.source === s.name);
    const name = c?.name ?? s.name;
    const processing: Record<string, unknown> = {};
    if (s.quantity === "transmittance-converted absorbance") processing.converted = "A = 2 − log10(%T)";
    if (c?.quantity && c.quantity !== s.quantity) processing.quantity_set_by_analyst = { read_as: s.quantity, set_to: c.quantity };
    const quantity = c?.quantity ?? s.quantity;
    const unit = c?.unit ?? (c?.quantity && c.quantity !== "absorbance" && s.unit === "AU" ? "" : s.unit);
    if (!blank) return { source: s.name, name, quantity, unit, series: s, processing, t: s.t, y: s.y };
    const t: number[] = [],
      y: number[] = [];
    let unmatched = 0;
    s.t.forEach((ti, i) => {
      const b = blankAt.get(ti);
      if (b === undefined) unmatched++;
      else {
        t.push(ti);
        y.push(s.y[i]! - b);
      }
    });
    processing.blank_subtracted = blank.name;
    if (unmatched) processing.blank_unmatched_points = unmatched;
    return { source: s.name, name, quantity, unit, series: s, processing, t, y };
  });
}

export interface IngestResult {
  run_id: number;
  raw_file_sha256: string;
  existing: boolean;
  series: Array<{ id: number; name: string; points: number }>;
}

/**
 * Stores an export: raw bytes (once per lab and SHA-256), run, series and the audit event, in one transaction.
 * The same file again answers with the existing run and writes nothing.
 */
export async function ingestExport(
  db: Knex,
  input: { labId: number; userId: number | null; actorLabel?: string; bytes: Uint8Array; fileName: string; mapping?: RunMapping; now?: Date; parsing?: Promise<ReadExport> },
): Promise<IngestResult> {
  const mapping: RunMapping = input.mapping ?? { run: {} };
  checkSize(input.fileName, input.bytes.length, await uploadLimitBytes(db, input.labId));
  const sha256 = sha256Hex(input.bytes);
  const existing = await findExistingRun(db, input.labId, sha256);
  if (existing) {
    const series = await listSeriesOfRun(db, input.labId, existing.id);
    return { run_id: existing.id, raw_file_sha256: sha256, existing: true, series: series.map((s) => ({ id: s.id, name: s.name, points: s.point_count })) };
  }
  const parsed = await (input.parsing ?? readExport(input.bytes, input.fileName, mapping));
  const stored = applyMapping(parsed, mapping, input.fileName);
  const at = (input.now ?? new Date()).toISOString();
  const r = mapping.run ?? {};
  const pick = <T>(v: T | null | undefined, fallback: T | null): T | null => (v === undefined ? fallback : v);
  // The object store (when configured) takes the bytes before the transaction: no network wait holds the database.
  const held = await storeRawBytes(input.labId, sha256, input.bytes);
  return db.transaction(async (trx) => {
    const method = r.method_id ? await newestMethodVersion(trx, input.labId, r.method_id) : null;
    if (r.method_id && !method) throw new AppError({ code: "unprocessable", message: `There is no method ${r.method_id} in this lab.` });
    const rawFileId = await insertRawFile(trx, {
      lab_id: input.labId,
      sha256,
      name: input.fileName,
      size: input.bytes.length,
      bytes: held.bytes,
      stored_in: held.stored_in,
      uploaded_by: input.userId,
      uploaded_at: at,
    });
    const runRow = {
      lab_id: input.labId,
      raw_file_id: rawFileId,
      name: r.name ?? input.fileName.replace(/\.[^.]+$/, ""),
      parser: parsed.parser,
      study: pick(r.study, null),
      wavelength_nm: pick(r.wavelength_nm, num(parsed.metadata.wavelength_nm)),
      path_length_cm: pick(r.path_length_cm, num(parsed.metadata.path_length_cm)),
      temperature_c: pick(r.temperature_c, num(parsed.metadata.temperature_c)),
      cell: pick(r.cell, null),
      operator: pick(r.operator, typeof parsed.metadata.operator === "string" ? parsed.metadata.operator : null),
      sample: pick(r.sample, null),
      method: method ? method.name : pick(r.method, null),
      method_record_id: method ? method.record_id : null,
      dilution_factor: pick(mapping.dilutionFactor, null),
      metadata: JSON.stringify(parsed.metadata),
      warnings: JSON.stringify(parsed.warnings),
      created_by: input.userId,
      created_at: at,
    };
    const runId = await insertRun(trx, runRow);
    const series: IngestResult["series"] = [];
    for (const [position, s] of stored.entries()) {
      const id = await insertSeries(trx, {
        run_id: runId,
        lab_id: input.labId,
        position,
        name: s.name,
        source_column: s.source,
        quantity: s.quantity,
        unit: s.unit,
        point_count: s.t.length,
        // The arrays are this ingest's own (from the parsing worker or the blank subtraction): no second copy.
        t_f64: ownedF64(s.t),
        y_f64: ownedF64(s.y),
        skipped_lines: JSON.stringify(s.series.skipped_lines),
        processing: JSON.stringify({ ...s.processing, ...(s.series.metadata ? { channel_metadata: s.series.metadata } : {}) }),
        t_min: s.t.length ? s.t[0]! : null,
        t_max: s.t.length ? s.t[s.t.length - 1]! : null,
      });
      series.push({ id, name: s.name, points: s.t.length });
    }
    await recordAudit(trx, {
      labId: input.labId,
      actorUserId: input.userId,
      actorLabel: input.actorLabel ?? null,
      action: "run.ingested",
      objectType: "run",
      objectId: runId,
      objectVersion: 1,
      newValues: { raw_file: { name: input.fileName, sha256, size: input.bytes.length }, parser: parsed.parser, series: series.map(({ name, points }) => ({ name, points })), mapping },
    });
    return { run_id: runId, raw_file_sha256: sha256, existing: false, series };
  });
}
