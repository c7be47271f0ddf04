// Raw files, runs and series. Points travel as little-endian float64 BLOBs (one per series and axis).
import { insertedId } from "./ids";
import { jsonObject, readJson } from "@/db/json";
import { z } from "zod";
import type { Db } from "@/db";
import type { DbRawFileRow, DbRunRow, DbSeriesRow } from "@/db/tables";

const LITTLE_ENDIAN = new Uint8Array(new Float64Array([1]).buffer)[7] === 0x3f;

/**
 * The same bytes as packF64 without copying a Float64Array on a little-endian machine: for a caller that owns the
 * array and hands it straight to the insert (ingest; bench ingest: a million points are 8 MB not held twice).
 */
export function ownedF64(values: ArrayLike<number>): Buffer {
  if (LITTLE_ENDIAN && values instanceof Float64Array) return Buffer.from(values.buffer, values.byteOffset, values.byteLength);
  return packF64(values);
}

export function packF64(values: ArrayLike<number>): Buffer {
  const a = values instanceof Float64Array ? values : Float64Array.from(values);
  const buf = Buffer.from(a.buffer, a.byteOffset, a.byteLength);
  if (LITTLE_ENDIAN) return Buffer.from(buf); // a copy the caller cannot change afterwards
  const out = Buffer.alloc(a.byteLength);
  for (let i = 0; i < a.length; i++) out.writeDoubleLE(a[i]!, i * 8);
  return out;
}

export function unpackF64(buf: Buffer | Uint8Array): Float64Array {
  const out = new Float64Array(buf.byteLength / 8);
  if (LITTLE_ENDIAN) new Uint8Array(out.buffer).set(buf);
  else {
    const b = Buffer.from(buf);
    for (let i = 0; i < out.length; i++) out[i] = b.readDoubleLE(i * 8);
  }
  return out;
}

export type NewRawFile = Omit<DbRawFileRow, "id">;
export type NewRun = Omit<DbRunRow, "id">;
export type NewSeries = Omit<DbSeriesRow, "id">;

export async function findRawFileBySha(db: Db, labId: number, sha256: string): Promise<Omit<DbRawFileRow, "bytes"> | undefined> {
  return db("raw_files").where({ lab_id: labId, sha256 }).first("id", "lab_id", "sha256", "name", "size", "uploaded_by", "uploaded_at");
}

export async function getRawFile(db: Db, labId: number, id: number): Promise<DbRawFileRow | undefined> {
  return db("raw_files").where({ lab_id: labId, id }).first();
}

export async function insertRawFile(db: Db, row: NewRawFile): Promise<number> {
  const [r] = await db("raw_files").insert(row).returning("id");
  return insertedId(r);
}

export async function insertRun(db: Db, row: NewRun): Promise<number> {
  const [r] = await db("runs").insert(row).returning("id");
  return insertedId(r);
}

export async function insertSeries(db: Db, row: NewSeries): Promise<number> {
  const [r] = await db("series").insert(row).returning("id");
  return insertedId(r);
}

export async function findRunsOfRawFile(db: Db, labId: number, rawFileId: number): Promise<DbRunRow[]> {
  return db("runs").where({ lab_id: labId, raw_file_id: rawFileId }).orderBy("id");
}

export interface RunListFilter {
  labId: number;
  study?: string;
  from?: string;
  to?: string;
  wavelengthMin?: number;
  wavelengthMax?: number;
  temperatureMin?: number;
  temperatureMax?: number;
  q?: string;
  sort: "created_at" | "name" | "wavelength_nm" | "temperature_c" | "study";
  dir: "asc" | "desc";
  limit: number;
  offset: number;
}

export type RunListRow = DbRunRow & { series_count: number; raw_file_name: string; raw_file_sha256: string; created_by_name: string | null };

export async function listRuns(db: Db, f: RunListFilter): Promise<{ rows: RunListRow[]; total: number }> {
  const base = db("runs as r").where("r.lab_id", f.labId);
  if (f.study) base.andWhere("r.study", f.study);
  if (f.from) base.andWhere("r.created_at", ">=", f.from);
  if (f.to) base.andWhere("r.created_at", "<=", f.to);
  if (f.wavelengthMin !== undefined) base.andWhere("r.wavelength_nm", ">=", f.wavelengthMin);
  if (f.wavelengthMax !== undefined) base.andWhere("r.wavelength_nm", "<=", f.wavelengthMax);
  if (f.temperatureMin !== undefined) base.andWhere("r.temperature_c", ">=", f.temperatureMin);
  if (f.temperatureMax !== undefined) base.andWhere("r.temperature_c", "<=", f.temperatureMax);
  if (f.q) base.andWhere((w) => w.whereLike("r.name", `%${f.q}%`).orWhereLike("r.sample", `%${f.q}%`));
  const totalRow = await base.clone().count<{ n: number | string }[]>({ n: "*" }).first();
  const rows = await base
    .clone()
    .join("raw_files as f", "f.id", "r.raw_file_id")
    .leftJoin("users as u", "u.id", "r.created_by")
    .select(
      "r.*",
      "f.name as raw_file_name",
      "f.sha256 as raw_file_sha256",
      "u.display_name as created_by_name",
      db("series as s").count("*").whereRaw("s.run_id = r.id").as("series_count"),
    )
    .orderBy(`r.${f.sort}`, f.dir)
    .orderBy("r.id", f.dir)
    .limit(f.limit)
    .offset(f.offset);
  return { rows: rows as RunListRow[], total: Number(totalRow?.n ?? 0) };
}

const runWarnings = z.array(z.string());
const lineNumbers = z.array(z.number().int());

/** A run as read: its metadata and warnings parsed and checked. */
export async function getRun(db: Db, labId: number, id: number): Promise<(Omit<DbRunRow, "metadata" | "warnings"> & { metadata: Record<string, unknown>; warnings: string[]; raw_file_name: string; raw_file_sha256: string; raw_file_size: number; created_by_name: string | null }) | undefined> {
  const r: (DbRunRow & { raw_file_name: string; raw_file_sha256: string; raw_file_size: number; created_by_name: string | null }) | undefined = await db("runs as r")
    .join("raw_files as f", "f.id", "r.raw_file_id")
    .leftJoin("users as u", "u.id", "r.created_by")
    .where({ "r.lab_id": labId, "r.id": id })
    .first("r.*", "f.name as raw_file_name", "f.sha256 as raw_file_sha256", "f.size as raw_file_size", "u.display_name as created_by_name");
  return r && { ...r, metadata: readJson(jsonObject, r.metadata, `metadata of run ${r.id}`), warnings: readJson(runWarnings, r.warnings, `warnings of run ${r.id}`) };
}

/** A series without its points, its skipped lines and processing notes parsed and checked. */
export type SeriesSummaryRow = Omit<DbSeriesRow, "t_f64" | "y_f64" | "skipped_lines" | "processing"> & { skipped_lines: number[]; processing: Record<string, unknown> };

export async function listSeriesOfRun(db: Db, labId: number, runId: number): Promise<SeriesSummaryRow[]> {
  const rows: Array<Omit<DbSeriesRow, "t_f64" | "y_f64">> = await db("series")
    .where({ lab_id: labId, run_id: runId })
    .orderBy("position")
    .select("id", "run_id", "lab_id", "position", "name", "source_column", "quantity", "unit", "point_count", "skipped_lines", "processing", "t_min", "t_max");
  return rows.map((s) => ({ ...s, skipped_lines: readJson(lineNumbers, s.skipped_lines, `skipped lines of series ${s.id}`), processing: readJson(jsonObject, s.processing, `processing notes of series ${s.id}`) }));
}

export async function getSeriesWithPoints(db: Db, labId: number, runId: number, seriesId: number): Promise<DbSeriesRow | undefined> {
  return db("series").where({ lab_id: labId, run_id: runId, id: seriesId }).first();
}

export async function countIngestRows(db: Db): Promise<Record<"raw_files" | "runs" | "series" | "audit_events", number>> {
  const out = {} as Record<"raw_files" | "runs" | "series" | "audit_events", number>;
  for (const t of ["raw_files", "runs", "series", "audit_events"] as const) {
    const r = await db(t).count<{ n: number | string }[]>({ n: "*" }).first();
    out[t] = Number(r?.n ?? 0);
  }
  return out;
}
