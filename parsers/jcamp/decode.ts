// JCAMP-DX (IUPAC) labelled data records and the (X++(Y..Y)) / (XY..XY) data tables, in AFFN and the ASDF forms:
// PAC, SQZ, DIF (with the Y-check that opens the next line) and DUP.
import { ParseError } from "../types";
import { PARSE_LIMITS } from "../limits";

export interface JcampDecoded {
  /** Labels as written (upper-cased, spaces and dashes removed, as the standard compares them), with their text. */
  labels: Record<string, string>;
  labelLines: Record<string, number>;
  form: "XYDATA" | "XYPOINTS";
  /** X as scaled by XFACTOR, per point (for XYDATA, from the header grid FIRSTX..LASTX). */
  x: number[];
  /** Y scaled by YFACTOR. */
  y: number[];
  /** Raw (unscaled) Y, for checks against the file. */
  rawY: number[];
  /** 1-based file line of each point. */
  lines: number[];
  yChecks: number;
  warnings: string[];
}

const SQZ: Record<string, number> = { "@": 0, A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8, I: 9, a: -1, b: -2, c: -3, d: -4, e: -5, f: -6, g: -7, h: -8, i: -9 };
const DIF: Record<string, number> = { "%": 0, J: 1, K: 2, L: 3, M: 4, N: 5, O: 6, P: 7, Q: 8, R: 9, j: -1, k: -2, l: -3, m: -4, n: -5, o: -6, p: -7, q: -8, r: -9 };
const DUP: Record<string, number> = { S: 1, T: 2, U: 3, V: 4, W: 5, X: 6, Y: 7, Z: 8, s: 9 };

type Token = { kind: "abs" | "dif" | "dup"; value: number };

function normaliseLabel(l: string): string {
  return l.toUpperCase().replace(/[\s\-/_]/g, "");
}

/** Splits one data line into tokens. `asdf` says the file uses compression characters (so E is SQZ 5, not an exponent). */
export function tokenizeLine(text: string, line: number, asdf: boolean): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  const s = text.replace(/\$\$.*$/, "");
  while (i < s.length) {
    const ch = s[i]!;
    if (ch === " " || ch === "," || ch === "\t" || ch === ";") {
      i++;
      continue;
    }
    if (ch === "?") {
      tokens.push({ kind: "abs", value: NaN });
      i++;
      continue;
    }
    let kind: Token["kind"];
    let lead: string;
    if (ch in SQZ) {
      kind = "abs";
      lead = String(SQZ[ch]);
    } else if (ch in DIF) {
      kind = "dif";
      lead = String(DIF[ch]);
    } else if (ch in DUP) {
      kind = "dup";
      lead = String(DUP[ch]);
    } else if (/[0-9.+-]/.test(ch)) {
      kind = "abs";
      lead = ch === "+" ? "" : ch;
    } else {
      throw new ParseError(`"${ch}" is not a JCAMP-DX data character`, line);
    }
    i++;
    let body = lead;
    while (i < s.length) {
      const c = s[i]!;
      if (/[0-9.]/.test(c)) body += c;
      else if (!asdf && kind === "abs" && (c === "E" || c === "e") && /[0-9+-]/.test(s[i + 1] ?? "")) {
        body += "e" + s[i + 1];
        i++;
      } else break;
      i++;
    }
    const v = Number(body === "-" || body === "" ? NaN : body);
    if (!Number.isFinite(v)) throw new ParseError(`"${body}" is not a number`, line);
    tokens.push({ kind, value: v });
  }
  return tokens;
}

export function decodeJcamp(text: string): JcampDecoded {
  const lines = text.split(/\r\n|\n|\r/);
  const labels: Record<string, string> = {};
  const labelLines: Record<string, number> = {};
  const warnings: string[] = [];
  let dataStart = -1;
  let form: JcampDecoded["form"] | null = null;
  for (let i = 0; i < lines.length; i++) {
    const m = lines[i]!.match(/^\s*##([^=]*)=(.*)$/);
    if (!m) continue;
    const key = normaliseLabel(m[1]!);
    const value = m[2]!.replace(/\$\$.*$/, "").trim();
    if (key === "XYDATA" || key === "XYPOINTS" || key === "DATATABLE") {
      if (dataStart >= 0) {
        warnings.push(`Only the first data table was read; another starts on line ${i + 1}.`);
        break;
      }
      const v = value.replace(/\s/g, "").toUpperCase();
      if (v.startsWith("(X++(Y..Y))")) form = "XYDATA";
      else if (v.startsWith("(XY..XY)")) form = "XYPOINTS";
      else throw new ParseError(`the data table form "${value}" is not supported (use (X++(Y..Y)) or (XY..XY))`, i + 1);
      labels[key] = value;
      labelLines[key] = i + 1;
      dataStart = i + 1;
      continue;
    }
    if (dataStart >= 0 && key === "END") break;
    if (dataStart < 0 && !(key in labels)) {
      labels[key] = value;
      labelLines[key] = i + 1;
    }
  }
  if (!form || dataStart < 0) throw new ParseError("The JCAMP-DX file has no ##XYDATA= or ##XYPOINTS= data table.");
  const num = (k: string, dflt?: number): number => {
    const v = labels[k];
    if (v === undefined) {
      if (dflt !== undefined) return dflt;
      throw new ParseError(`the label ##${k}= is missing`, labelLines.XYDATA ?? labelLines.XYPOINTS);
    }
    const n = Number(v);
    if (!Number.isFinite(n)) throw new ParseError(`##${k}= "${v}" is not a number`, labelLines[k]);
    return n;
  };
  const xFactor = num("XFACTOR", 1);
  const yFactor = num("YFACTOR", 1);

  // Data lines run to the next label.
  const dataLines: Array<{ text: string; line: number }> = [];
  for (let i = dataStart; i < lines.length; i++) {
    const l = lines[i]!;
    if (/^\s*##/.test(l)) break;
    if (l.replace(/\$\$.*$/, "").trim()) dataLines.push({ text: l, line: i + 1 });
  }
  const asdf = dataLines.some((d) => /[@A-DF-Za-df-s%]/.test(d.text.replace(/\$\$.*$/, "")));

  const rawY: number[] = [];
  const lineOf: number[] = [];
  const xs: number[] = [];
  let yChecks = 0;
  if (form === "XYPOINTS") {
    for (const d of dataLines) {
      const tok = tokenizeLine(d.text, d.line, asdf);
      if (tok.length % 2 !== 0) throw new ParseError("an (XY..XY) line holds an odd number of values", d.line);
      if (rawY.length + tok.length / 2 > PARSE_LIMITS.maxPoints) throw tooMany(d.line);
      for (let k = 0; k < tok.length; k += 2) {
        xs.push(tok[k]!.value * xFactor);
        rawY.push(tok[k + 1]!.value);
        lineOf.push(d.line);
      }
    }
  } else {
    let lastY = NaN;
    let lastWasDif = false;
    let lastDif = 0;
    let pendingCheck = false;
    for (const d of dataLines) {
      const tok = tokenizeLine(d.text, d.line, asdf);
      if (tok.length === 0) continue;
      if (tok[0]!.kind !== "abs") throw new ParseError("a data line must start with an X value", d.line);
      if (rawY.length + tok.length > PARSE_LIMITS.maxPoints) throw tooMany(d.line);
      let checkThisLine = pendingCheck;
      let endedInDif = false;
      for (let k = 1; k < tok.length; k++) {
        const t = tok[k]!;
        if (t.kind === "abs") {
          if (checkThisLine) {
            // The Y-check: the first Y of a line after a DIF line repeats the previous line's last Y.
            checkThisLine = false;
            yChecks++;
            if (t.value !== lastY) throw new ParseError(`the Y-check ${t.value} does not match the previous line's last value ${lastY}`, d.line);
            lastWasDif = false;
            continue;
          }
          lastY = t.value;
          lastWasDif = false;
          rawY.push(lastY);
          lineOf.push(d.line);
        } else if (t.kind === "dif") {
          if (checkThisLine) throw new ParseError("a line after a DIF line must start with an absolute Y-check", d.line);
          if (!Number.isFinite(lastY)) throw new ParseError("a difference (DIF) has no value before it", d.line);
          lastDif = t.value;
          lastY += lastDif;
          lastWasDif = true;
          rawY.push(lastY);
          lineOf.push(d.line);
        } else {
          const repeats = t.value - 1;
          if (repeats < 0 || !Number.isInteger(t.value)) throw new ParseError(`a DUP count of ${t.value} is not valid`, d.line);
          if (rawY.length + repeats > PARSE_LIMITS.maxPoints) throw tooMany(d.line);
          for (let r = 0; r < repeats; r++) {
            if (lastWasDif) lastY += lastDif;
            rawY.push(lastY);
            lineOf.push(d.line);
          }
        }
        endedInDif = lastWasDif;
      }
      pendingCheck = endedInDif;
    }
    const n = labels.NPOINTS !== undefined ? num("NPOINTS") : rawY.length;
    if (n !== rawY.length) throw new ParseError(`##NPOINTS= says ${n} points but the table holds ${rawY.length}`, labelLines.NPOINTS);
    const firstX = num("FIRSTX");
    const lastX = num("LASTX");
    const dx = n > 1 ? (lastX - firstX) / (n - 1) : 0;
    for (let k = 0; k < n; k++) xs.push(firstX + k * dx);
  }
  return {
    labels,
    labelLines,
    form,
    x: xs,
    y: rawY.map((v) => v * yFactor),
    rawY,
    lines: lineOf,
    yChecks,
    warnings,
  };
}

function tooMany(line: number): ParseError {
  return new ParseError(`more than ${PARSE_LIMITS.maxPoints.toLocaleString("en")} readings, the most an export may hold`, line);
}
