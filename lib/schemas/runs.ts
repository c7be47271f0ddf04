// One schema per resource: runs, their mapping at upload, the list query.
import { z } from "zod";
import type { DbRunRow } from "@/db/tables";
import { lineText } from "./common";

const optionalNumber = z.number().finite().nullable().optional();
const optionalText = lineText(200).nullable().optional();

export const channelMappingSchema = z.strictObject({
  /** The series name as the parser gave it (its column header). */
  source: z.string().max(200),
  include: z.boolean().default(true),
  name: lineText(200).pipe(z.string().min(1)).optional(),
  /** What the readings are, where the file did not say or said it wrongly (recorded with the series). */
  quantity: z.enum(["absorbance", "concentration", "signal"]).optional(),
  unit: z.string().trim().min(1).max(32).optional(),
});

export const runMappingSchema = z.strictObject({
  parser: z.string().max(40).optional(),
  timeColumn: z.string().max(200).optional(),
  channels: z.array(channelMappingSchema).max(96).optional(),
  /** A channel holding the blank, subtracted from the others at the same times. */
  blank: z.string().max(200).nullable().optional(),
  dilutionFactor: z.number().positive().finite().nullable().optional(),
  run: z
    .strictObject({
      name: lineText(255).pipe(z.string().min(1)).optional(),
      study: optionalText,
      wavelength_nm: optionalNumber,
      path_length_cm: z.number().positive().finite().nullable().optional(),
      temperature_c: optionalNumber,
      cell: optionalText,
      operator: optionalText,
      sample: optionalText,
      method: optionalText,
      /** A method record of the lab: its newest version evaluates the run's fits. */
      method_id: z.number().int().positive().nullable().optional(),
    })
    .default({}),
});
export type RunMapping = z.infer<typeof runMappingSchema>;

export const runListQuerySchema = z.object({
  study: z.string().max(200).optional(),
  from: z.string().max(40).optional(),
  to: z.string().max(40).optional(),
  wavelengthMin: z.coerce.number().optional(),
  wavelengthMax: z.coerce.number().optional(),
  temperatureMin: z.coerce.number().optional(),
  temperatureMax: z.coerce.number().optional(),
  q: z.string().max(100).optional(),
  sort: z.enum(["created_at", "name", "wavelength_nm", "temperature_c", "study"]).default("created_at"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type RunListQuery = z.infer<typeof runListQuerySchema>;

export const seriesPointsQuerySchema = z.object({
  /** For display: every point goes out as binary from …/points, never as JSON. */
  maxPoints: z.coerce.number().int().min(10).max(20_000).optional(),
});

/** The run columns the API shows, as stored (the row type is the one source of their names and types). */
export type RunFields = Pick<
  DbRunRow,
  "id" | "name" | "study" | "parser" | "wavelength_nm" | "path_length_cm" | "temperature_c" | "cell" | "operator" | "sample" | "method" | "method_record_id" | "dilution_factor" | "created_at"
>;

export interface RunSummary extends RunFields {
  series_count: number;
  raw_file: { id: number; name: string; sha256: string; size?: number };
  created_by: string | null;
}

export interface SeriesSummary {
  id: number;
  name: string;
  source_column: string;
  quantity: string;
  unit: string;
  points: number;
  skipped_lines: number[];
  processing: Record<string, unknown>;
  t_range: [number, number] | null;
}

export interface RunDetail extends RunSummary {
  metadata: Record<string, unknown>;
  warnings: string[];
  series: SeriesSummary[];
}

export interface UploadPreview {
  sha256: string;
  name: string;
  size: number;
  parser: string;
  parsers: Array<{ name: string; confidence: number }>;
  metadata: Record<string, string | number>;
  warnings: string[];
  columns: Array<{ index: number; header: string; role: "time" | "channel"; unit: string | null }>;
  /** t and y thinned for the preview plot; first_t and first_y the first readings exactly as read (time in s). */
  series: Array<{ name: string; quantity: string; unit: string; points: number; skipped_lines: number[]; t: number[]; y: number[]; first_t: number[]; first_y: number[]; wavelength_nm: number | null }>;
  head: Array<{ line: number; text: string }>;
  existing: { run_id: number; name: string; created_at: string } | null;
  suggested: { name: string; wavelength_nm: number | null; path_length_cm: number | null; temperature_c: number | null; operator: string | null; sample: string | null };
}
