// The CPU-heavy work the server hands to its worker threads: what each job does, as plain functions (the worker calls
// them; so does the in-process path the CLI uses). Inputs and outputs cross threads by structured clone.
import { fitGlobal, fitSeriesWithOptions, type GlobalFitResult, type GlobalForm, type GlobalRun, type SeriesFitOutcome, type SeriesFitOptions } from "@/lib/kinetics";
import { runValidation, type ValidationReport } from "@/lib/validation";
import type { ValidationRecord } from "@/lib/validation/records";
import { drawFitReport } from "@/lib/reports/fit-pdf";
import { drawStudyReport } from "@/lib/reports/study-pdf";
import type { FitReportData, StudyReportData } from "@/lib/reports/records";
import { drawValidationReport } from "@/lib/reports/validation-pdf";
import { parseExport, ParseError, rankParsers, type ParsedExport, type ParsedSeries, type Readings } from "@/parsers";

/** A parsed series whose times and readings cross threads as Float64Arrays (moved, not copied). */
export type PackedSeries = Omit<ParsedSeries, "t" | "y"> & { t: Float64Array; y: Float64Array };
export type PackedExport = Omit<ParsedExport, "series"> & { series: PackedSeries[] };

/** How far a long job has got (sent from the worker thread to the server's job record). */
export type Progress = (done: number, total: number, note: string) => void;

export interface JobTypes {
  "fit-series": { input: { t: Float64Array; y: Float64Array; options: SeriesFitOptions }; output: SeriesFitOutcome };
  "global-fit": { input: { model: string; runs: GlobalRun[]; form: GlobalForm }; output: GlobalFitResult };
  "validation-run": { input: { referenceDir?: string }; output: ValidationReport };
  "parse-export": {
    input: { bytes: Uint8Array; fileName: string; parser?: string; timeColumn?: string };
    output: { parsed: PackedExport | null; error: { message: string; reason: string; line?: number } | null; ranking: Array<{ name: string; confidence: number }> };
  };
  "fit-report": { input: FitReportData; output: { name: string; bytes: Uint8Array } };
  "study-report": { input: StudyReportData; output: { name: string; bytes: Uint8Array } };
  "validation-report": { input: { rec: ValidationRecord; labName: string }; output: { name: string; bytes: Uint8Array } };
}
export type JobKind = keyof JobTypes;


export const WORK: { [K in JobKind]: (input: JobTypes[K]["input"], progress: Progress) => JobTypes[K]["output"] | Promise<JobTypes[K]["output"]> } = {
  "fit-report": (data) => drawFitReport(data),
  "study-report": (data) => drawStudyReport(data),
  "validation-report": (data) => drawValidationReport(data),
  "fit-series": ({ t, y, options }) => fitSeriesWithOptions(t, y, options),
  "global-fit": ({ model, runs, form }) => fitGlobal(model, runs, form),
  "validation-run": ({ referenceDir }, progress) => runValidation({ referenceDir, onProgress: (done, total, id) => progress(done, total, id) }),
  "parse-export": ({ bytes, fileName, parser, timeColumn }) => {
    const ranking = rankParsers(bytes, fileName).map((r) => ({ name: r.parser.name, confidence: r.confidence }));
    const r = parseExport(bytes, fileName, parser, { timeColumn });
    if (r instanceof ParseError) return { parsed: null, error: { message: r.message, reason: r.reason, line: r.line }, ranking };
    const packed = (a: Readings) => (a instanceof Float64Array ? a : Float64Array.from(a));
    return { parsed: { ...r, series: r.series.map((s) => ({ ...s, t: packed(s.t), y: packed(s.y) })) }, error: null, ranking };
  },
};

/**
 * The buffers of an output's typed arrays, for postMessage's transfer list: a million-point series moves between
 * threads without a copy (a number[] of that size costs 100–200 ms to clone; bench ingest).
 */
export function transferables(value: unknown, depth = 0, found = new Set<ArrayBuffer>()): ArrayBuffer[] {
  if (depth > 6 || value === null || typeof value !== "object") return [...found];
  if (ArrayBuffer.isView(value)) {
    const b = value.buffer;
    if (b instanceof ArrayBuffer && value.byteOffset === 0 && value.byteLength === b.byteLength) found.add(b);
  } else if (Array.isArray(value)) {
    if (value.length <= 1000) for (const v of value) transferables(v, depth + 1, found);
  } else for (const v of Object.values(value)) transferables(v, depth + 1, found);
  return [...found];
}
