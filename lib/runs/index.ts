// Reading stored runs: the paged list, one run with its series, a series' points (decimated for display by the app's
// one decimator, lib/plot/decimate.ts; every point as binary little-endian float64 for fits) and the original file.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { getRawFile, getRun, getSeriesWithPoints, listRuns, listSeriesOfRun, unpackF64 } from "@/db/queries/runs";
import { decimate } from "@/lib/plot/decimate";
import { readRawBytes } from "@/lib/storage/raw-store";
import { AppError } from "@/lib/errors";
import type { RunDetail, RunFields, RunListQuery, RunSummary, SeriesSummary } from "@/lib/schemas/runs";

/** Points sent to a plot unless more are asked for; fits always read every point. */
export const DISPLAY_POINTS = 2000;

type RunRowLike = RunFields & { raw_file_id: number; raw_file_name: string; raw_file_sha256: string; created_by_name: string | null };

function summary(r: RunRowLike, seriesCount: number, size?: number): RunSummary {
  return {
    id: r.id,
    name: r.name,
    study: r.study,
    parser: r.parser,
    wavelength_nm: r.wavelength_nm,
    path_length_cm: r.path_length_cm,
    temperature_c: r.temperature_c,
    cell: r.cell,
    operator: r.operator,
    sample: r.sample,
    method: r.method,
    method_record_id: r.method_record_id,
    dilution_factor: r.dilution_factor,
    series_count: seriesCount,
    raw_file: { id: r.raw_file_id, name: r.raw_file_name, sha256: r.raw_file_sha256, ...(size !== undefined ? { size } : {}) },
    created_at: r.created_at,
    created_by: r.created_by_name,
  };
}

export async function listLabRuns(db: Knex, labId: number, q: RunListQuery) {
  const { rows, total } = await listRuns(db, {
    labId,
    study: q.study,
    from: q.from,
    to: q.to,
    wavelengthMin: q.wavelengthMin,
    wavelengthMax: q.wavelengthMax,
    temperatureMin: q.temperatureMin,
    temperatureMax: q.temperatureMax,
    q: q.q,
    sort: q.sort,
    dir: q.dir,
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { runs: rows.map((r) => summary(r, Number(r.series_count))), total, page: q.page, pageSize: q.pageSize };
}

export async function getRunDetail(db: Knex, labId: number, runId: number): Promise<RunDetail> {
  const r = await getRun(db, labId, runId);
  if (!r) throw new AppError({ code: "not_found", message: `There is no run ${runId} in this lab.` });
  const series = await listSeriesOfRun(db, labId, runId);
  return {
    ...summary(r, series.length, r.raw_file_size),
    metadata: r.metadata,
    warnings: r.warnings,
    series: series.map(
      (s): SeriesSummary => ({
        id: s.id,
        name: s.name,
        source_column: s.source_column,
        quantity: s.quantity,
        unit: s.unit,
        points: s.point_count,
        skipped_lines: s.skipped_lines,
        processing: s.processing,
        t_range: s.t_min === null || s.t_max === null ? null : [s.t_min, s.t_max],
      }),
    ),
  };
}

/** Every point of a series, as stored (for fits). */
export async function readSeries(db: Knex, labId: number, runId: number, seriesId: number) {
  const s = await getSeriesWithPoints(db, labId, runId, seriesId);
  if (!s) throw new AppError({ code: "not_found", message: `There is no series ${seriesId} in run ${runId}.` });
  return { row: s, t: unpackF64(s.t_f64), y: unpackF64(s.y_f64) };
}

/** A series' stored points as they are kept (little-endian float64 BLOBs), for the binary endpoint. */
export async function seriesBinary(db: Knex, labId: number, runId: number, seriesId: number): Promise<{ points: number; t: Buffer; y: Buffer }> {
  const s = await getSeriesWithPoints(db, labId, runId, seriesId);
  if (!s) throw new AppError({ code: "not_found", message: `There is no series ${seriesId} in run ${runId}.` });
  return { points: s.point_count, t: Buffer.from(s.t_f64), y: Buffer.from(s.y_f64) };
}

export async function seriesForDisplay(db: Knex, labId: number, runId: number, seriesId: number, opts: { maxPoints?: number }) {
  const { row, t, y } = await readSeries(db, labId, runId, seriesId);
  const limit = opts.maxPoints ?? DISPLAY_POINTS;
  let tx: number[], yx: number[];
  if (t.length <= limit) {
    tx = Array.from(t);
    yx = Array.from(y);
  } else {
    // Half the limit in buckets: each gives at most three points (first, lowest, highest), most give two.
    ({ x: tx, y: yx } = decimate(t, y, Math.max(1, Math.floor(limit / 3))));
  }
  return {
    id: row.id,
    name: row.name,
    quantity: row.quantity,
    unit: row.unit,
    points: row.point_count,
    decimated: tx.length < row.point_count ? { method: "min/max per bucket", shown: tx.length } : null,
    t: tx,
    y: yx,
  };
}

export async function rawFileDownload(db: Knex, labId: number, id: number) {
  const f = await getRawFile(db, labId, id);
  if (!f) throw new AppError({ code: "not_found", message: `There is no raw file ${id} in this lab.` });
  // Every read re-hashes the bytes (from the row or the object store): a replaced file is refused, never served.
  const read = await readRawBytes(f);
  if (!read.ok) throw new AppError({ code: "conflict", message: `${read.problem} It is not served; tell the lab administrator.` });
  return { name: f.name, sha256: f.sha256, size: f.size, bytes: read.bytes };
}
