// The one domain type every parser produces; raw row types never leave parsers/.
import type { Quantity } from "@/lib/units";

/** A column of numbers as a parser hands it over. */
export type Readings = number[] | Float64Array;

export interface ParsedSeries {
  name: string;
  quantity: Quantity;
  /** Unit of y as stored: "AU" for absorbance (also after %T conversion), else as written. */
  unit: string;
  /** Seconds. The byte-level reader writes Float64Arrays (channels of one table may share their times); the others arrays. */
  t: Readings;
  y: Readings;
  /** 1-based file line numbers whose cell in this series was empty or not a number (over-range markers). */
  skipped_lines: number[];
  /** Per-channel numbers read from the header, e.g. { wavelength_nm: 590 }. */
  metadata?: Record<string, number | string>;
}

export interface ParsedExport {
  parser: string;
  /** Keys as found, plus recognised numbers: wavelength_nm, path_length_cm, temperature_c. */
  metadata: Record<string, string | number>;
  series: ParsedSeries[];
  warnings: string[];
  /** 1-based line of the table's header row, where there is one (for previews). */
  header_line?: number;
  /** The columns as found, for the mapping form. */
  columns?: Array<{ index: number; header: string; role: "time" | "channel"; unit: string | null }>;
}

export class ParseError extends Error {
  override name = "ParseError";
  readonly line?: number;
  /** The message without its line prefix (to rebuild the error on another thread). */
  readonly reason: string;
  constructor(message: string, line?: number) {
    super(line ? `line ${line}: ${message}` : message);
    this.line = line;
    this.reason = message;
  }
}

export interface ParseOptions {
  /** The header of the column that holds time, where the parser's own choice is wrong. */
  timeColumn?: string;
}

export interface ExportParser {
  name: string;
  /** 0 (cannot be this format) to 1 (certainly this format). */
  sniff(bytes: Uint8Array, fileName: string): number;
  /** Refused input comes back as a ParseError (with a line where there is one), never half a result. */
  parse(bytes: Uint8Array, fileName: string, options?: ParseOptions): ParsedExport | ParseError;
}
