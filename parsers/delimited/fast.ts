// The byte-level reader for plain numeric tables: the head of the file (metadata, header, first rows) is found as the
// general path finds it, then the table's bytes are read straight into numbers, row by row, without decoding the file
// into one string or splitting it into a million lines. Anything unusual (a quote, an empty or text cell, a blank line,
// a row of another width, time going back, %T at or below 0, a non-ASCII byte, a lone CR, lines after the table, a
// limit passed) hands the whole file back to the general path, which gives the result or the line-accurate error.
// Same results by construction: the same grammar of numbers, each converted exactly as Number() converts it.
import { percentTToAbsorbance } from "@/lib/units";
import { PARSE_LIMITS } from "../limits";
import { checkTextShape, splitLines } from "../text";
import { ParseError } from "../types";
import { findTable, sniffSample, splitCells, type FoundTable, type TablePlan, type TypedRows } from "./parse";

/** Bytes decoded for the head: the metadata block, header and first rows of any export fit well within. */
const HEAD_BYTES = 256 * 1024;
/** Bytes decoded at the end for the dialect's sample (the last 200 lines). */
const TAIL_BYTES = 64 * 1024;

// 10^0 … 10^22: every one exact as a double, so m·10^e or m/10^e with an integer m < 2^53 is one correctly rounded
// operation, the same double Number() gives (Clinger's fast path, which V8's own string-to-number also takes).
const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));

const NL = 10,
  CR = 13,
  SP = 32,
  TAB = 9;

function decodeStrict(bytes: Uint8Array): string | null {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
}

/** Byte offset where 0-based line `idx` starts, counting CRLF, LF and lone CR as splitLines does. */
function lineOffset(bytes: Uint8Array, start: number, idx: number): number {
  let line = 0;
  let p = start;
  while (line < idx && p < bytes.length) {
    const b = bytes[p]!;
    p++;
    if (b === NL) line++;
    else if (b === CR) {
      if (bytes[p] === NL) p++;
      line++;
    }
  }
  return p;
}

export interface PlainTable {
  found: FoundTable;
  plan: TablePlan;
  rows: TypedRows;
}

/**
 * Reads a plain numeric table at byte level, or answers null for the general path. `planColumns` is the general
 * path's own column planning, given the table found and its first row.
 */
export function readPlainTable(bytes: Uint8Array, planColumns: (found: FoundTable, firstRow: string[]) => TablePlan): PlainTable | null {
  if (bytes.length === 0) return null;
  let start = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3;
  else if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) return null;
  else {
    // The general path's binary probe: a file it would refuse goes to it for its message.
    const probe = bytes.subarray(0, Math.min(bytes.length, 65536));
    let control = 0;
    for (let i = 0; i < probe.length; i++) {
      const b = probe[i]!;
      if (b === 0) return null;
      if (b < 9 || (b > 13 && b < 32)) control++;
    }
    if (control > probe.length * 0.01) return null;
  }

  // The head, cut at a line end.
  let headEnd = bytes.length;
  const complete = bytes.length - start <= HEAD_BYTES;
  if (!complete) {
    const nl = bytes.lastIndexOf(NL, start + HEAD_BYTES - 1);
    if (nl < start) return null;
    headEnd = nl + 1;
  }
  const headText = decodeStrict(bytes.subarray(start, headEnd));
  if (headText === null) return null;
  try {
    checkTextShape(headText);
  } catch {
    return null;
  }
  const headLines = splitLines(headText);
  let sample: readonly string[];
  if (complete) sample = sniffSample(headLines);
  else {
    // A long file: its first and last 200 lines, as the general path samples them.
    if (headLines.length <= 400) return null;
    const tailStart = Math.max(headEnd, bytes.length - TAIL_BYTES);
    const tailBytes = bytes.subarray(tailStart);
    for (let i = 0; i < tailBytes.length; i++) if (tailBytes[i]! >= 0x80) return null;
    const tailLines = splitLines(new TextDecoder("utf-8").decode(tailBytes)).slice(1); // ASCII, checked above
    if (tailLines.length < 200) return null;
    sample = [...headLines.slice(0, 200), ...tailLines.slice(-200)];
  }

  let found: FoundTable;
  let plan: TablePlan;
  try {
    found = findTable(headLines, sample, { encoding: "utf-8", text: headText, warnings: [] });
    if (!complete) {
      // The table's start was judged on the line after it: that line must be inside the head.
      let j = found.first + 1;
      while (j < headLines.length && !headLines[j]!.trim()) j++;
      if (j >= headLines.length) return null;
    }
    if (found.delimiter === "whitespace") return null;
    const firstLine = headLines[found.first]!;
    if (firstLine.includes('"')) return null;
    plan = planColumns(found, splitCells(firstLine, found.delimiter));
  } catch (e) {
    if (e instanceof ParseError) return null;
    throw e;
  }
  if (plan.reader.format !== "number") return null;

  const rows = scanRows(bytes, lineOffset(bytes, start, found.first), found, plan);
  return rows ? { found, plan, rows } : null;
}

/** Reads every row from `pos` to the end of the file, or null at the first thing the general path should judge. */
function scanRows(bytes: Uint8Array, pos: number, found: FoundTable, plan: TablePlan): TypedRows | null {
  const delim = found.delimiter === "," ? 44 : found.delimiter === ";" ? 59 : TAB;
  const comma = found.decimalComma;
  const width = found.headerCells.length;
  const { channels, kinds, timeCol, unitFactor } = plan;
  // Column → channel (−1 for time).
  const channelOf = new Int32Array(width).fill(-1);
  channels.forEach(({ i }, q) => (channelOf[i] = q));
  const percentT = kinds.map((k) => k.percentT);
  const maxRows = Math.floor(PARSE_LIMITS.maxPoints / channels.length);
  // Rows are lines from here on: counted first (a native byte search), so every column is one Float64Array of its
  // final length from the start, with no growing arrays and no copy at the end.
  let lines = 0;
  for (let q = bytes.indexOf(NL, pos); q !== -1; q = bytes.indexOf(NL, q + 1)) lines++;
  if (bytes[bytes.length - 1] !== NL) lines++;
  if (lines > maxRows) return null;
  const t = new Float64Array(lines);
  const ys = channels.map(() => new Float64Array(lines));
  let count = 0;
  const row = new Float64Array(width);
  const n = bytes.length;
  let line = found.first; // 0-based index of the line being read
  let prevT = -Infinity;
  let p = pos;

  while (p < n) {
    const lineStart = p;
    let col = 0;
    for (;;) {
      while (p < n && (bytes[p] === SP || (bytes[p] === TAB && delim !== TAB))) p++;
      // A number: [+-] digits [sep digits] [e [+-] digits], or [+-] sep digits [...].
      const numStart = p;
      let neg = false;
      let b = bytes[p];
      if (b === 45) {
        neg = true;
        b = bytes[++p];
      } else if (b === 43) b = bytes[++p];
      let m = 0,
        sig = 0,
        frac = 0,
        digits = 0;
      while (b !== undefined && b >= 48 && b <= 57) {
        if (sig > 0 || b !== 48) sig++;
        m = m * 10 + (b - 48);
        digits++;
        b = bytes[++p];
      }
      if (b === 46 || (comma && b === 44)) {
        b = bytes[++p];
        while (b !== undefined && b >= 48 && b <= 57) {
          if (sig > 0 || b !== 48) sig++;
          m = m * 10 + (b - 48);
          digits++;
          frac++;
          b = bytes[++p];
        }
      }
      if (digits === 0) return null;
      let exp = 0;
      if (b === 101 || b === 69) {
        b = bytes[++p];
        let eneg = false;
        if (b === 45) {
          eneg = true;
          b = bytes[++p];
        } else if (b === 43) b = bytes[++p];
        let ed = 0;
        while (b !== undefined && b >= 48 && b <= 57) {
          if (exp < 100_000) exp = exp * 10 + (b - 48);
          ed++;
          b = bytes[++p];
        }
        if (ed === 0) return null;
        if (eneg) exp = -exp;
      }
      const e10 = exp - frac;
      let v: number;
      if (sig <= 15 && e10 >= -22 && e10 <= 22) {
        v = e10 >= 0 ? m * POW10[e10]! : m / POW10[-e10]!;
        if (neg) v = -v;
      } else {
        // Beyond the exact fast path: the cell's own text through Number(), as the general path reads it.
        const s = String.fromCharCode(...bytes.subarray(numStart, p));
        v = Number(comma ? s.replace(",", ".") : s);
      }
      while (p < n && (bytes[p] === SP || (bytes[p] === TAB && delim !== TAB))) p++;
      if (col >= width) return null;
      row[col++] = v;
      b = bytes[p];
      if (b === delim) {
        p++;
        continue;
      }
      if (b === undefined || b === NL || b === CR) break;
      return null;
    }
    if (col !== width) return null;
    if (bytes[p] === CR) {
      if (bytes[p + 1] !== NL) return null;
      p += 2;
    } else if (p < n) p++;
    if (p - lineStart > PARSE_LIMITS.maxLineChars) return null;
    line++;
    if (line > PARSE_LIMITS.maxLines) return null;
    const tv = row[timeCol]! * unitFactor;
    if (tv < prevT || count >= lines) return null;
    prevT = tv;
    t[count] = tv;
    for (let c = 0; c < width; c++) {
      const q = channelOf[c]!;
      if (q < 0) continue;
      let y = row[c]!;
      if (percentT[q]) {
        if (!(y > 0)) return null;
        y = percentTToAbsorbance(y);
      }
      ys[q]![count] = y;
    }
    count++;
  }
  if (count === 0) return null;
  const cut = (a: Float64Array) => (count === lines ? a : a.slice(0, count));
  const times = cut(t);
  return {
    // One array of times for every channel of the table (they are the same readings of the same clock).
    ts: channels.map(() => times),
    ys: ys.map(cut),
    skipped: channels.map(() => []),
    why: channels.map(() => ({ empty: [], over: [], nonPositiveT: [], text: [] })),
  };
}
