// Bytes to text for text-based exports: BOM-detected UTF-8 / UTF-16, UTF-8 without BOM, Windows-1252 as a fallback
// (said in a warning), and binary files refused.
import { PARSE_LIMITS } from "./limits";
import { ParseError } from "./types";

export interface DecodedText {
  text: string;
  encoding: "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";
  warnings: string[];
}

/** Decodes an export and checks its shape (line length, line count) before anything splits it. */
export function decodeText(bytes: Uint8Array): DecodedText {
  const decoded = decodeOnly(bytes);
  checkTextShape(decoded.text);
  return decoded;
}

function decodeOnly(bytes: Uint8Array): DecodedText {
  if (bytes.length === 0) throw new ParseError("The file is empty.");
  const warnings: string[] = [];
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { text: strict("utf-8", bytes.subarray(3)), encoding: "utf-8", warnings };
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: strict("utf-16le", bytes.subarray(2)), encoding: "utf-16le", warnings };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: strict("utf-16be", bytes.subarray(2)), encoding: "utf-16be", warnings };
  // No BOM: NUL bytes mean UTF-16 without a BOM or a binary file; neither is read as text.
  const probe = bytes.subarray(0, Math.min(bytes.length, 65536));
  let nul = 0,
    control = 0;
  for (const b of probe) {
    if (b === 0) nul++;
    else if (b < 9 || (b > 13 && b < 32)) control++;
  }
  if (nul > 0 || control > probe.length * 0.01) {
    throw new ParseError(
      nul > 0 && nul >= probe.length / 3
        ? "The file looks like UTF-16 text without a byte-order mark, or a binary file; export it as UTF-8 or UTF-16 with a BOM."
        : "The file is binary, not a text export (it contains NUL or control bytes). Export the data as CSV or plain text.",
    );
  }
  try {
    return { text: strict("utf-8", bytes), encoding: "utf-8", warnings };
  } catch {
    warnings.push("The file is not valid UTF-8; it was read as Windows-1252 (Western European). Check degree signs and µ.");
    return { text: new TextDecoder("windows-1252").decode(bytes), encoding: "windows-1252", warnings };
  }
}

/**
 * One pass over the text before it is split: refuses, at the first line that passes it, a line longer than any export
 * writes (a million columns on one line) or more lines than an export may hold (a file of newlines), so neither is
 * split into millions of strings first.
 */
export function checkTextShape(text: string, limits: { maxLineChars: number; maxLines: number } = PARSE_LIMITS): void {
  let line = 1;
  let start = 0;
  const n = text.length;
  for (let i = 0; i <= n; i++) {
    const c = i < n ? text.charCodeAt(i) : 10;
    if (c !== 10 && c !== 13) continue;
    if (i - start > limits.maxLineChars)
      throw new ParseError(`the line is ${(i - start).toLocaleString("en")} characters long; a line may hold at most ${limits.maxLineChars.toLocaleString("en")} (is the table written across instead of down?)`, line);
    if (i === n) break;
    if (c === 13 && text.charCodeAt(i + 1) === 10) i++;
    line++;
    start = i + 1;
    if (line > limits.maxLines && start < n) throw new ParseError(`the file has more than ${limits.maxLines.toLocaleString("en")} lines, the most an export may hold`, line);
  }
}

function strict(encoding: string, bytes: Uint8Array): string {
  try {
    return new TextDecoder(encoding, { fatal: true }).decode(bytes);
  } catch {
    throw new ParseError(`The file starts with a ${encoding.toUpperCase()} byte-order mark but is not valid ${encoding.toUpperCase()}.`);
  }
}

/** Lines without their terminators (CRLF, LF or CR); index 0 is line 1. */
export function splitLines(text: string): string[] {
  const lines = text.split(/\r\n|\n|\r/);
  if (lines.length > 1 && lines[lines.length - 1] === "") lines.pop();
  return lines;
}

/**
 * Whole numbers only: "0.6x12" is not a number. Returns NaN for text, and "partial" for a cell that starts like a
 * number and does not finish as one (refused by the parsers rather than skipped).
 */
export function readNumber(cell: string, decimalComma: boolean): number | "partial" {
  // Fast path first: Number() accepts every plain decimal; the checks after it refuse what Number() would also take
  // but a spectrophotometer never writes as a reading (hex, binary, "Infinity", an empty cell read as 0).
  const norm = decimalComma ? cell.replace(",", ".") : cell;
  const v = Number(norm);
  if (Number.isFinite(v)) {
    const s = norm.trim();
    if (s !== "" && !/[xXbBoO_]/.test(s)) return v;
    if (s === "") return NaN;
  }
  const s = norm.trim();
  if (s === "") return NaN;
  if (/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return Number(s);
  if (/^[+-]?(\d|\.\d)/.test(s)) return "partial";
  return NaN;
}
