// Delimited text exports (comma, semicolon, tab or whitespace; decimal point or comma; a metadata block before the
// header row; one or many channels). papaparse tokenises the table; typing, units and time are ours.
import Papa from "papaparse";
import { percentTToAbsorbance, timeUnitFactor, type Quantity } from "@/lib/units";
import { readMetadata } from "../metadata";
import { PARSE_LIMITS } from "../limits";
import { decodeText, readNumber, splitLines } from "../text";
import { ParseError, type ParsedExport, type ParsedSeries, type ParseOptions, type Readings } from "../types";
import { classifyTime, timeReader, type TimeReader } from "./time";
import { readPlainTable } from "./fast";

/** Cells instruments write instead of a reading beyond their range (common practice; no one standard spells them). */
const OVER_RANGE = /^(over(range|flow)?|over-range|ovr(ng)?|sat(urated)?|high|hi|range|o\.?r\.?|>.*|\*+|\+?inf(inity)?)$/i;

export type Delimiter = "," | ";" | "\t" | "whitespace";

interface Dialect {
  delimiter: Delimiter;
  decimalComma: boolean;
}

const CANDIDATES: Delimiter[] = ["\t", ";", ",", "whitespace"];

export function splitCells(line: string, d: Delimiter): string[] {
  if (d === "whitespace") return line.trim().split(/\s+/);
  return line.split(d);
}

/** A line that could be a data row: two or more cells, the first a time. */
function looksLikeData(cells: string[]): boolean {
  return cells.length >= 2 && classifyTime(cells[0]!.replace(/^"|"$/g, "")) !== null;
}

/** Picks the delimiter that splits the most lines into rows that start with a time. */
export function sniffDialect(lines: readonly string[]): Dialect | null {
  let best: { d: Delimiter; score: number } | null = null;
  const sample = lines.length > 400 ? [...lines.slice(0, 200), ...lines.slice(-200)] : lines;
  for (const d of CANDIDATES) {
    let score = 0;
    for (const l of sample) {
      if (!l.trim()) continue;
      const cells = splitCells(l, d);
      if (!looksLikeData(cells)) continue;
      // Reward splits whose cells read as numbers (with a decimal comma where the delimiter allows one): "0,00;1,02"
      // split on commas starts with a number too, but leaves "00;1" behind.
      let numeric = 0;
      for (const c of cells) {
        const v = c.trim().replace(/^"|"$/g, "");
        if (classifyTime(v) !== null || (d !== "," && /^[+-]?\d+,\d+$/.test(v))) numeric++;
      }
      score += numeric / cells.length + Math.min(cells.length, 16) / 1000;
    }
    if (score > 0 && (!best || score > best.score + 1e-9)) best = { d, score };
  }
  if (!best) return null;
  // Decimal comma: only where the delimiter is not itself a comma, and numbers use a comma and no point.
  let comma = 0,
    point = 0;
  if (best.d !== ",") {
    for (const l of sample) {
      for (const c of splitCells(l, best.d)) {
        if (/^[+-]?\d+,\d+([eE][+-]?\d+)?$/.test(c.trim())) comma++;
        else if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(c.trim())) point++;
      }
    }
  }
  return { delimiter: best.d, decimalComma: comma > point };
}

const TIME_HEADER = /^(time|t|zeit|temps|tiempo|elapsed|clock|time of day|tod|date|datetime|timestamp)\b|^t\s*[/(\[]|^time/i;

/** "Time (min)", "t/s", "Time [h]", "time_s" → the unit written with the header, if any. */
export function headerUnit(header: string): string | null {
  const h = header.trim();
  const m = h.match(/[([]\s*([^)\]]+?)\s*[)\]]\s*$/) ?? h.match(/\/\s*([^/]+?)\s*$/) ?? h.match(/_(ms|s|sec|min|h|hr)$/i);
  return m ? m[1]!.trim() : null;
}

export interface ChannelKind {
  quantity: Quantity;
  unit: string;
  percentT: boolean;
  fromHeader: boolean;
}

function channelKind(header: string, defaultKind: ChannelKind | null): ChannelKind {
  const h = header.trim();
  const unit = headerUnit(h);
  if (/%\s*T\b|\bT\s*%|transmittance|\btrans\b/i.test(h) || (unit && /^%\s*T?$/i.test(unit)))
    return { quantity: "transmittance-converted absorbance", unit: "AU", percentT: true, fromHeader: true };
  if (/^(a|abs|absorbance|od|optical density)\b/i.test(h) || (unit && /^(au|abs|a|od)$/i.test(unit)))
    return { quantity: "absorbance", unit: "AU", percentT: false, fromHeader: true };
  if (unit && /^(m|mm|µm|um|nm|mol\/l|mmol\/l|µmol\/l|umol\/l|mg\/l|g\/l|µg\/ml|ug\/ml|mg\/ml|ppm)$/i.test(unit))
    return { quantity: "concentration", unit, percentT: false, fromHeader: true };
  if (/^conc/i.test(h)) return { quantity: "concentration", unit: unit ?? "", percentT: false, fromHeader: true };
  if (defaultKind) return defaultKind;
  return { quantity: "absorbance", unit: "AU", percentT: false, fromHeader: false };
}

function unquote(c: string): string {
  const t = c.trim();
  return t.length >= 2 && t.startsWith('"') && t.endsWith('"') ? t.slice(1, -1).replace(/""/g, '"').trim() : t;
}

export interface LocatedTable extends FoundTable {
  /** Table rows from `first` on: row r is file line first + 1 + r, tokenised on demand (no array of a million rows). */
  rowCount: number;
  row(r: number): string[];
}

/** The table found at the top of an export: dialect, metadata block, header row and its first data row (0-based). */
export interface FoundTable {
  warnings: string[];
  delimiter: Delimiter;
  decimalComma: boolean;
  headerIdx: number;
  headerCells: string[];
  first: number;
  meta: ReturnType<typeof readMetadata>;
}

/**
 * Finds the table in the lines of an export. `sample` is what the dialect is sniffed from (the first and last 200
 * lines of a long file); `lines` must reach at least the line after the first data row.
 */
export function findTable(lines: readonly string[], sample: readonly string[], decoded: { encoding: string; text: string; warnings: string[] }): FoundTable {
  const warnings = [...decoded.warnings];
  if (lines.every((l) => !l.trim())) throw new ParseError("The file is empty (it holds only blank lines).");

  const dialect = sniffDialect(sample);
  if (!dialect) {
    const single = lines.findIndex((l) => classifyTime(l.trim()) !== null);
    if (single >= 0) throw new ParseError("the file has only one column; a time column and at least one channel are needed", single + 1);
    const header = lines.findIndex((l) => {
      const cells = l.split(/[,;\t]/);
      return cells.length >= 2 && TIME_HEADER.test(unquote(cells[0]!));
    });
    if (header >= 0) throw new ParseError("a header row but no data rows below it", header + 1);
    const meta = lines.filter((l) => /[:;=\t]/.test(l)).length;
    throw new ParseError(
      meta > 0
        ? `The file has ${meta} line${meta > 1 ? "s" : ""} of metadata but no table of numbers (no row starts with a time followed by readings).`
        : "No table of numbers was found: no row starts with a time followed by readings.",
    );
  }
  const { delimiter, decimalComma } = dialect;

  // The table starts at the first of two successive data-like rows with the same number of cells (a lone
  // "1;2" in a metadata block is not a table), or at a lone data row that ends the file.
  const cellsOf = (i: number) => splitCells(lines[i]!, delimiter);
  let first = -1;
  for (let i = 0; i < lines.length; i++) {
    const c = cellsOf(i);
    if (!looksLikeData(c)) continue;
    let j = i + 1;
    while (j < lines.length && !lines[j]!.trim()) j++;
    if (j >= lines.length || (looksLikeData(cellsOf(j)) && cellsOf(j).length === c.length) || !looksLikeData(cellsOf(j))) {
      first = i;
      break;
    }
  }
  // The header: the nearest non-blank line above the table, if it is not metadata-shaped data.
  let headerIdx = -1;
  for (let i = first - 1; i >= 0; i--) {
    if (!lines[i]!.trim()) continue;
    headerIdx = i;
    break;
  }
  if (first < 0) {
    // Rows of cells but none starting with a time: a header with no data, or a table whose times are unreadable.
    const hdr = lines.findIndex((l) => splitCells(l, delimiter).length >= 2);
    throw new ParseError("a header row but no data rows below it", hdr + 1);
  }
  const dataWidth = cellsOf(first).length;
  if (dataWidth - 1 > PARSE_LIMITS.maxChannels)
    throw new ParseError(`the table has ${(dataWidth - 1).toLocaleString("en")} channels; an export may hold at most ${PARSE_LIMITS.maxChannels}`, first + 1);
  let headerCells: string[] | null = null;
  if (headerIdx >= 0) {
    const hc = parseRow(lines[headerIdx]!, delimiter).map(unquote);
    const trimmed = trimTrailingEmpty(hc, dataWidth);
    if (trimmed.length === dataWidth && !looksLikeData(hc)) headerCells = trimmed;
  }
  const metaEnd = headerCells ? headerIdx : first;
  const meta = readMetadata(lines.slice(0, metaEnd).map((text, i) => ({ text, line: i + 1 })));
  if (meta.declaredEncoding) {
    const declared = meta.declaredEncoding.name.toLowerCase().replace(/[^a-z0-9]/g, "");
    const actual = decoded.encoding.replace(/[^a-z0-9]/g, "");
    const compatible =
      declared.startsWith(actual.slice(0, 5)) ||
      (["ascii", "usascii"].includes(declared) && actual === "utf8") ||
      (["latin1", "iso88591", "cp1252", "windows1252", "ansi"].includes(declared) && (actual === "windows1252" || !/[^\x00-\x7f]/.test(decoded.text)));
    if (!compatible)
      throw new ParseError(`the file declares its encoding as "${meta.declaredEncoding.name}" but its bytes are ${decoded.encoding.toUpperCase()}; export it again or correct the declaration`, meta.declaredEncoding.line);
  }
  if (!headerCells) {
    headerCells = Array.from({ length: dataWidth }, (_, i) => (i === 0 ? "Time" : `Channel ${i}`));
    warnings.push(`No header row was found above the table (line ${first + 1}); columns are named Time, Channel 1, ….`);
  }
  return { warnings, delimiter, decimalComma, headerIdx, headerCells, first, meta };
}

/** The sample of lines the dialect is sniffed from: all of a short file, the first and last 200 lines of a long one. */
export function sniffSample(lines: readonly string[]): readonly string[] {
  return lines.length > 400 ? [...lines.slice(0, 200), ...lines.slice(-200)] : lines;
}

/** Finds the table in a delimited export: dialect, metadata block, header row, data rows (not yet typed). */
export function locateTable(bytes: Uint8Array): LocatedTable {
  const decoded = decodeText(bytes);
  const lines = splitLines(decoded.text);
  const found = findTable(lines, sniffSample(lines), decoded);
  const { warnings, first, delimiter } = found;
  const cellsOf = (i: number) => splitCells(lines[i]!, delimiter);

  // Tokenise the table with papaparse (quoted fields, its fast path when there are none).
  let last = lines.length - 1;
  while (last > first && !looksLikeData(cellsOf(last))) last--;
  const trailing = lines.slice(last + 1).map((l, i) => [l, last + 2 + i] as const).filter(([l]) => l.trim());
  if (trailing.length) warnings.push(`${trailing.length} line(s) after the table were not read (from line ${trailing[0]![1]}).`);
  const { rowCount, row } = tokenize(lines, first, last, delimiter);
  return { ...found, warnings, rowCount, row };
}

/** How the table's columns are read: time column and its reader, the channels and what each holds. */
export interface TablePlan {
  timeCol: number;
  reader: TimeReader;
  unitFactor: number;
  channels: Array<{ h: string; i: number }>;
  kinds: ChannelKind[];
  warnings: string[];
}

function planColumns(found: FoundTable, firstRow: string[], options: ParseOptions): TablePlan {
  const { headerCells, headerIdx, first, meta, decimalComma } = found;
  const warnings = [...found.warnings];
  // Columns: time (by header name, else the first), the rest channels.
  let timeCol = headerCells.findIndex((h) => TIME_HEADER.test(h.trim()));
  if (timeCol < 0) timeCol = 0;
  if (options.timeColumn !== undefined) {
    timeCol = headerCells.indexOf(options.timeColumn);
    if (timeCol < 0) throw new ParseError(`there is no column "${options.timeColumn}" to read time from (columns: ${headerCells.map((h) => `"${h}"`).join(", ")})`, (headerIdx >= 0 ? headerIdx : first) + 1);
  }
  const timeHeader = headerCells[timeCol]!;
  const tUnit = headerUnit(timeHeader);
  let unitFactor = tUnit ? timeUnitFactor(tUnit) : null;
  if (tUnit && unitFactor === null && !/^(hh?:mm(:ss)?|mm:ss|clock|iso.*|utc|local)$/i.test(tUnit))
    throw new ParseError(`the time column's unit "${tUnit}" is not a unit of time`, (headerIdx >= 0 ? headerIdx : first) + 1);
  if (unitFactor === null && meta.timeUnit) unitFactor = meta.timeUnit.factor;
  const firstTime = firstRow[timeCol] ?? "";
  const reader = timeReader(unquote(firstTime), {
    unitFactor: unitFactor ?? 1,
    decimalComma,
    clockHint: /clock|time of day|\btod\b|uhrzeit/i.test(timeHeader),
    elapsedHint: /elapsed|duration|relative/i.test(timeHeader),
  });
  if (reader.format === "number" && unitFactor === null) warnings.push(`The time column "${timeHeader}" gives no unit anywhere; its numbers were taken as seconds.`);
  warnings.push(...reader.warnings);

  const defaultKind = metadataKind(meta.metadata);
  const channels = headerCells.map((h, i) => ({ h, i })).filter(({ i }) => i !== timeCol);
  if (channels.length === 0) throw new ParseError("the table has only a time column; at least one channel is needed", first + 1);
  const kinds = channels.map(({ h }) => channelKind(h, defaultKind));
  if (kinds.some((k) => !k.fromHeader) && !defaultKind)
    warnings.push(`No unit was given for ${channels.filter((_, q) => !kinds[q]!.fromHeader).map((c) => `"${c.h}"`).join(", ")}: the readings were taken as absorbance.`);
  return { timeCol, reader, unitFactor: unitFactor ?? 1, channels, kinds, warnings };
}

/** The typed table: each channel's times and readings, and the lines whose cell was skipped (with why). */
export interface TypedRows {
  ts: Readings[];
  ys: Readings[];
  skipped: number[][];
  why: Array<{ empty: number[]; over: Array<[number, string]>; nonPositiveT: number[]; text: Array<[number, string]> }>;
}

/** The general path: every row tokenised, every cell read and checked, errors naming their line. */
function readRows(table: LocatedTable, plan: TablePlan): TypedRows {
  const { headerCells, headerIdx, first, rowCount, row, decimalComma } = table;
  const { channels, kinds, reader, timeCol } = plan;
  const t: number[] = [];
  const ys = channels.map(() => [] as number[]);
  const ts = channels.map(() => [] as number[]);
  const skipped = channels.map(() => [] as number[]);
  // Why each skipped cell was skipped, for the warning: empty, an instrument's over-range marker, a reading of 0 %T or
  // below, or other text.
  const why = channels.map(() => ({ empty: [] as number[], over: [] as Array<[number, string]>, nonPositiveT: [] as number[], text: [] as Array<[number, string]> }));
  let prevT = -Infinity;
  let prevLine = 0;
  const maxRows = Math.floor(PARSE_LIMITS.maxPoints / channels.length);
  for (let r = 0; r < rowCount; r++) {
    const line = first + 1 + r;
    const cells = row(r);
    if (cells.length === 1 && cells[0]!.trim() === "") continue; // blank line inside the table
    const cellsT = trimTrailingEmpty(cells, headerCells.length);
    if (cellsT.length !== headerCells.length)
      throw new ParseError(`the row has ${cellsT.length} cell${cellsT.length === 1 ? "" : "s"} but the header has ${headerCells.length}`, line);
    const tv = reader.read(unquote(cellsT[timeCol]!), line);
    if (tv < prevT) throw new ParseError(`the time goes backwards (${unquote(cellsT[timeCol]!)} is earlier than the reading on line ${prevLine})`, line);
    prevT = tv;
    prevLine = line;
    if (t.length >= maxRows)
      throw new ParseError(`more than ${PARSE_LIMITS.maxPoints.toLocaleString("en")} readings (${channels.length} channel${channels.length === 1 ? "" : "s"} × ${maxRows.toLocaleString("en")} rows), the most an export may hold`, line);
    t.push(tv);
    channels.forEach(({ h, i }, q) => {
      const raw = unquote(cellsT[i]!);
      const v = readNumber(raw, decimalComma);
      if (v === "partial") throw new ParseError(`"${h}" holds "${raw}", which is not a number`, line);
      const kind = kinds[q]!;
      const y = kind.percentT ? (v > 0 ? percentTToAbsorbance(v) : NaN) : v;
      if (Number.isNaN(y)) {
        skipped[q]!.push(line);
        const w = why[q]!;
        if (raw.trim() === "") w.empty.push(line);
        else if (OVER_RANGE.test(raw.trim())) w.over.push([line, raw.trim()]);
        else if (!Number.isNaN(v)) w.nonPositiveT.push(line);
        else w.text.push([line, raw.trim()]);
      }
      else {
        ts[q]!.push(tv);
        ys[q]!.push(y);
      }
    });
  }
  if (t.length === 0) throw new ParseError("a header row but no data rows below it", (headerIdx >= 0 ? headerIdx : first) + 1);
  return { ts, ys, skipped, why };
}

/**
 * Reads a delimited export. Plain numeric tables go through the byte-level reader (fast.ts), which reads the bytes
 * straight into numbers and hands anything unusual back to the general path here; `{ fast: false }` forces the general
 * path (the tests compare the two on every fixture).
 */
export function parseDelimitedText(bytes: Uint8Array, options: ParseOptions = {}, how: { fast?: boolean } = {}): ParsedExport {
  if (how.fast !== false) {
    const quick = readPlain(bytes, options);
    if (quick) return assemble(quick.found, quick.plan, quick.rows);
  }
  const table = locateTable(bytes);
  const plan = planColumns(table, table.row(0), options);
  return assemble(table, plan, readRows(table, plan));
}

/** The byte-level reader with this parser's column planning; null where the general path must read the file. */
export function readPlain(bytes: Uint8Array, options: ParseOptions = {}) {
  return readPlainTable(bytes, (found, firstRow) => planColumns(found, firstRow, options));
}

function assemble(found: FoundTable, plan: TablePlan, rows: TypedRows): ParsedExport {
  const { headerIdx, headerCells, first, meta } = found;
  const { channels, kinds, timeCol } = plan;
  const warnings = [...plan.warnings];
  const { ts, ys, skipped, why } = rows;
  const series: ParsedSeries[] = channels.map(({ h }, q) => {
    if (ys[q]!.length === 0)
      throw new ParseError(`the channel "${h}" has no numbers at all`, (headerIdx >= 0 ? headerIdx : first) + 1);
    const wl = h.match(/(\d+(?:[.,]\d+)?)\s*nm\b/i);
    const kind = kinds[q]!;
    const w = why[q]!;
    const lines = (ls: number[]) => `line${ls.length === 1 ? "" : "s"} ${ls.slice(0, 8).join(", ")}${ls.length > 8 ? ", …" : ""}`;
    if (w.over.length)
      warnings.push(`"${h}": ${w.over.length} over-range marker${w.over.length === 1 ? "" : "s"} ("${w.over[0]![1]}": the reading was beyond the instrument's range) skipped, ${lines(w.over.map((x) => x[0]))}.`);
    if (w.nonPositiveT.length) warnings.push(`"${h}": ${w.nonPositiveT.length} reading${w.nonPositiveT.length === 1 ? "" : "s"} of 0 %T or below (no absorbance) skipped, ${lines(w.nonPositiveT)}.`);
    if (w.empty.length) warnings.push(`"${h}": ${w.empty.length} empty cell${w.empty.length === 1 ? "" : "s"} skipped, ${lines(w.empty)}.`);
    if (w.text.length) warnings.push(`"${h}": ${w.text.length} cell${w.text.length === 1 ? "" : "s"} of text that is not a reading ("${w.text[0]![1].slice(0, 40)}") skipped, ${lines(w.text.map((x) => x[0]))}.`);
    return {
      name: h,
      quantity: kind.quantity,
      unit: kind.unit,
      t: ts[q]!,
      y: ys[q]!,
      skipped_lines: skipped[q]!,
      ...(wl ? { metadata: { wavelength_nm: Number(wl[1]!.replace(",", ".")) } } : {}),
    };
  });

  const metadata = { ...meta.metadata };
  if (metadata.wavelength_nm === undefined && series.length === 1 && series[0]!.metadata?.wavelength_nm !== undefined)
    metadata.wavelength_nm = series[0]!.metadata.wavelength_nm;
  return {
    parser: "delimited",
    metadata,
    series,
    warnings,
    header_line: headerIdx >= 0 && headerCells ? headerIdx + 1 : undefined,
    columns: headerCells.map((h, i) => ({ index: i, header: h, role: i === timeCol ? "time" : "channel", unit: headerUnit(h) })),
  };
}

function metadataKind(meta: Record<string, string | number>): ChannelKind | null {
  for (const [k, v] of Object.entries(meta)) {
    if (!/unit|mode|ordinate|y\s*axis|data type|measurement/i.test(k) || typeof v !== "string") continue;
    if (/%\s*T|transmittance/i.test(v)) return { quantity: "transmittance-converted absorbance", unit: "AU", percentT: true, fromHeader: false };
    if (/abs|absorbance|\bA\b|AU|OD/i.test(v)) return { quantity: "absorbance", unit: "AU", percentT: false, fromHeader: false };
  }
  return null;
}

function parseRow(line: string, d: Delimiter): string[] {
  if (d === "whitespace") return splitCells(line, d);
  const r = Papa.parse<string[]>(line, { delimiter: d, quoteChar: '"' });
  return r.data[0] ?? [];
}

function tokenize(lines: string[], first: number, last: number, d: Delimiter): { rowCount: number; row: (r: number) => string[] } {
  const rowCount = last - first + 1;
  if (d === "whitespace") return { rowCount, row: (r) => (lines[first + r]!.trim() ? splitCells(lines[first + r]!, d) : [""]) };
  // Without a quote anywhere, a plain split is the same tokenisation, done row by row as the rows are read (bench:
  // 1M rows, papaparse on the joined table 0.7 s more and a row array of the whole file in memory); papaparse handles
  // every table that quotes a field.
  let quoted = false;
  for (let i = first; i <= last && !quoted; i++) if (lines[i]!.includes('"')) quoted = true;
  if (!quoted) return { rowCount, row: (r) => lines[first + r]!.split(d) };
  const parsed = Papa.parse<string[]>(lines.slice(first, last + 1).join("\n"), { delimiter: d, quoteChar: '"', newline: "\n", skipEmptyLines: false });
  if (parsed.data.length !== rowCount) {
    // A quoted field spanning lines would shift every line number after it: refuse rather than misnumber.
    throw new ParseError("a quoted cell spans more than one line; line numbers could not be kept");
  }
  return { rowCount, row: (r) => parsed.data[r]! };
}

function trimTrailingEmpty(cells: string[], want: number): string[] {
  let n = cells.length;
  while (n > want && cells[n - 1]!.trim() === "") n--;
  return n === cells.length ? cells : cells.slice(0, n);
}

