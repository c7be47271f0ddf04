// Time cells to seconds: numbers with a unit, mm:ss, hh:mm:ss (elapsed or clock time of day), ISO 8601 timestamps.
import { ParseError } from "../types";

export type TimeFormat = "number" | "mm:ss" | "hh:mm:ss" | "clock" | "iso";

const MMSS = /^(\d+):(\d{1,2}(?:[.,]\d+)?)$/;
const HHMMSS = /^(\d+):(\d{2}):(\d{2}(?:[.,]\d+)?)\s*([AaPp][Mm])?$/;
const ISO = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/;

export function classifyTime(cell: string): TimeFormat | null {
  const s = cell.trim();
  if (ISO.test(s)) return "iso";
  const h = s.match(HHMMSS);
  if (h) return h[4] ? "clock" : "hh:mm:ss";
  if (MMSS.test(s)) return "mm:ss";
  if (/^[+-]?(\d+[.,]?\d*|[.,]\d+)([eE][+-]?\d+)?$/.test(s)) return "number";
  return null;
}

export interface TimeReader {
  format: TimeFormat;
  /** Seconds for one cell; throws ParseError naming the line. */
  read(cell: string, line: number): number;
  warnings: string[];
}

/**
 * Builds a reader for a time column from its first cell. `unitFactor` is seconds per unit for plain numbers;
 * `clockHint` says the header calls the column a clock time / time of day.
 */
export function timeReader(first: string, opts: { unitFactor: number; decimalComma: boolean; clockHint: boolean; elapsedHint: boolean }): TimeReader {
  const format0 = classifyTime(first);
  if (!format0) throw new ParseError(`the first time cell "${first.trim()}" is not a time`);
  const warnings: string[] = [];
  let format: TimeFormat = format0;
  if (format === "hh:mm:ss") {
    const hours = Number(first.trim().split(":")[0]);
    // Elapsed times start near zero; a first reading an hour or more "in" is a clock time of day, unless the
    // header says elapsed.
    if (opts.clockHint || (!opts.elapsedHint && hours >= 1)) {
      format = "clock";
      warnings.push("The time column holds clock times of day: t counts from the first row (crossing midnight where the clock goes back).");
    }
  } else if (format === "clock") {
    warnings.push("The time column holds clock times of day: t counts from the first row (crossing midnight where the clock goes back).");
  } else if (format === "iso") {
    warnings.push("The time column holds date-times: t counts from the first row.");
  }
  const num = (s: string) => Number(opts.decimalComma ? s.replace(",", ".") : s);
  let origin: number | null = null;
  let dayOffset = 0;
  let lastClock = -Infinity;
  const read = (cell: string, line: number): number => {
    const s = cell.trim();
    if (s === "") throw new ParseError("the time cell is empty; every reading needs its time", line);
    const f = classifyTime(s);
    const sameFamily = f === format || (format === "clock" && (f === "hh:mm:ss" || f === "clock"));
    if (!sameFamily) {
      if (f === null && /^[+-]?(\d|\.\d)/.test(s)) throw new ParseError(`the time "${s}" is not a number`, line);
      throw new ParseError(`the time "${s}" is not written like the first row's (${format})`, line);
    }
    switch (format) {
      case "number":
        return num(s) * opts.unitFactor;
      case "mm:ss": {
        const m = s.match(MMSS)!;
        return Number(m[1]) * 60 + num(m[2]!);
      }
      case "hh:mm:ss": {
        const m = s.match(HHMMSS)!;
        return Number(m[1]) * 3600 + Number(m[2]) * 60 + num(m[3]!);
      }
      case "clock": {
        const m = s.match(HHMMSS)!;
        let h = Number(m[1]);
        const ampm = m[4]?.toLowerCase();
        if (ampm === "pm" && h < 12) h += 12;
        if (ampm === "am" && h === 12) h = 0;
        if (h > 23 || Number(m[2]) > 59) throw new ParseError(`"${s}" is not a clock time`, line);
        const secOfDay = h * 3600 + Number(m[2]) * 60 + num(m[3]!);
        if (secOfDay < lastClock) {
          // A clock that goes back by more than half a day has passed midnight; a smaller step back is an error.
          if (lastClock - secOfDay > 43_200) dayOffset += 86400;
          else throw new ParseError(`the time goes backwards (${s} after a later clock time)`, line);
        }
        lastClock = secOfDay;
        const abs = secOfDay + dayOffset;
        origin ??= abs;
        return abs - origin;
      }
      case "iso": {
        const ms = Date.parse(s.replace(" ", "T"));
        if (!Number.isFinite(ms)) throw new ParseError(`"${s}" is not a valid date-time`, line);
        origin ??= ms;
        return (ms - origin) / 1000;
      }
    }
  };
  return { format, read, warnings };
}
