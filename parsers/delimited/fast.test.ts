// The byte-level reader against the general path: identical series (bit for bit), warnings, metadata and errors on
// every fixture in the repository and on generated long tables with a fault placed at the start, middle and end.
// The numbers' reference is Number() itself (ECMAScript's string-to-number, correctly rounded), compared bit for bit.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ParseError } from "../types";
import { parseDelimitedText, readPlain } from "./parse";
import { seededRandom } from "@/tests/helpers/random";

type Outcome = { ok: true; value: ReturnType<typeof parseDelimitedText> } | { ok: false; message: string; line?: number };

function outcome(bytes: Uint8Array, fast: boolean): Outcome {
  try {
    return { ok: true, value: parseDelimitedText(bytes, {}, { fast }) };
  } catch (e) {
    if (e instanceof ParseError) return { ok: false, message: e.message, line: e.line };
    throw e;
  }
}

const bits = (a: ArrayLike<number>) => Buffer.from(Float64Array.from(a).buffer).toString("hex");

function expectSame(bytes: Uint8Array, label: string) {
  const fast = outcome(bytes, true);
  const general = outcome(bytes, false);
  expect(fast.ok, label).toBe(general.ok);
  if (!fast.ok || !general.ok) {
    expect(fast, label).toEqual(general);
    return;
  }
  const { series: fs1, ...rest1 } = fast.value;
  const { series: fs2, ...rest2 } = general.value;
  expect(rest1, label).toEqual(rest2);
  expect(fs1.length).toBe(fs2.length);
  fs1.forEach((s, i) => {
    const g = fs2[i]!;
    expect({ ...s, t: bits(s.t), y: bits(s.y) }, `${label} series ${i}`).toEqual({ ...g, t: bits(g.t), y: bits(g.y) });
  });
}

/** Does the byte-level reader take this file (rather than hand it to the general path)? */
function takes(bytes: Uint8Array): boolean {
  return readPlain(bytes) !== null;
}

function fixtureFiles(): string[] {
  const roots = [path.join(__dirname, "fixtures"), path.resolve(__dirname, "../../fixtures")];
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of fs.readdirSync(d, { withFileTypes: true })) {
      const p = path.join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (/\.(csv|txt|dat|tsv|jdx|dx)$/i.test(e.name)) out.push(p);
    }
  };
  roots.forEach(walk);
  return out;
}

describe("byte-level reader and general path agree", () => {
  const files = fixtureFiles();
  it("finds the repository's fixtures", () => {
    expect(files.length).toBeGreaterThan(30);
  });
  for (const f of files) {
    it(path.relative(path.resolve(__dirname, "../.."), f), () => {
      expectSame(new Uint8Array(fs.readFileSync(f)), f);
    });
  }
});

/** A long table in a given dialect: numbers written every way the grammar allows, from a seeded generator. */
function longTable(opts: { rows: number; channels: number; sep: string; comma?: boolean; crlf?: boolean; bom?: boolean; percentT?: boolean; spaces?: boolean }): string {
  const rnd = seededRandom(opts.rows * 31 + opts.channels);
  const nl = opts.crlf ? "\r\n" : "\n";
  const dec = (s: string) => (opts.comma ? s.replace(".", ",") : s);
  const unit = opts.percentT ? "%T" : "A";
  const head = [`# Exported ${opts.rows} rows`, `Wavelength: 590 nm`, `Path length: 1 cm`, "", ["Time (s)", ...Array.from({ length: opts.channels }, (_, c) => `Cell ${c + 1} (${unit})`)].join(opts.sep)];
  const lines: string[] = [];
  let t = 0;
  const forms = [
    (v: number) => v.toFixed(6),
    (v: number) => v.toExponential(4),
    (v: number) => v.toPrecision(17),
    (v: number) => String(v),
    (v: number) => (v < 1 && v > 0 ? v.toFixed(3).replace(/^0/, "") : v.toFixed(2)),
    (v: number) => v.toExponential(9).toUpperCase(),
    (v: number) => `${v.toFixed(1)}e-0`,
    (v: number) => (v >= 0 ? `+${v.toFixed(5)}` : v.toFixed(5)),
  ];
  for (let i = 0; i < opts.rows; i++) {
    t += rnd.uniform() < 0.05 ? 0 : 0.1 + rnd.uniform();
    const cells = [dec(rnd.uniform() < 0.5 ? t.toFixed(3) : String(Number(t.toFixed(3))))];
    for (let c = 0; c < opts.channels; c++) {
      let v = opts.percentT ? 5 + 90 * rnd.uniform() : (rnd.uniform() - 0.1) * 2;
      if (!opts.percentT && rnd.uniform() < 0.01) v = -0;
      const s = dec(forms[Math.floor(rnd.uniform() * forms.length)]!(v));
      cells.push(opts.spaces ? ` ${s} ` : s);
    }
    lines.push(cells.join(opts.sep));
  }
  return (opts.bom ? "\uFEFF" : "") + [...head, ...lines].join(nl) + nl;
}

const enc = (s: string) => new TextEncoder().encode(s);

describe("long generated tables", () => {
  const dialects = [
    { name: "comma, LF", rows: 30_000, channels: 2, sep: "," },
    { name: "semicolon, decimal comma, CRLF, BOM", rows: 30_000, channels: 3, sep: ";", comma: true, crlf: true, bom: true },
    { name: "tab, %T, spaces around cells", rows: 20_000, channels: 4, sep: "\t", percentT: true, spaces: true },
    { name: "short file, comma", rows: 300, channels: 1, sep: "," },
  ];
  for (const d of dialects) {
    it(`${d.name}: taken by the byte-level reader, same series as the general path`, () => {
      const bytes = enc(longTable(d));
      expect(takes(bytes)).toBe(true);
      expectSame(bytes, d.name);
    });
  }

  // A fault at the start, middle and end of the table: the byte-level reader hands over and the general path gives the
  // same warnings (skipped cells, lines after the table) or the same line-accurate error.
  const faults: Array<[string, (line: string) => string]> = [
    ["empty cell", (l) => l.replace(/,[^,]*$/, ",")],
    ["over-range marker", (l) => l.replace(/,[^,]*$/, ",OVER")],
    ["text in a cell", (l) => l.replace(/,[^,]*$/, ",n/a")],
    ["half a number", (l) => l.replace(/,[^,]*$/, ",0.6x12")],
    ["quoted cell", (l) => l.replace(/,([^,]*)$/, ',"$1"')],
    ["missing cell", (l) => l.replace(/,[^,]*$/, "")],
    ["extra cell", (l) => `${l},0.5`],
    ["time going back", (l) => l.replace(/^[^,]*/, "0.0")],
    ["hexadecimal", (l) => l.replace(/,[^,]*$/, ",0x1F")],
    ["blank line", () => ""],
  ];
  const base = longTable({ rows: 2_000, channels: 2, sep: "," }).split("\n");
  const firstRow = base.findIndex((l) => /^\d/.test(l));
  for (const [name, fault] of faults) {
    for (const where of ["start", "middle", "end"] as const) {
      it(`${name} at the ${where} of the table`, () => {
        const lines = [...base];
        const i = where === "start" ? firstRow + 5 : where === "middle" ? Math.floor(lines.length / 2) : lines.length - 2;
        lines[i] = fault(lines[i]!);
        const bytes = enc(lines.join("\n"));
        expect(takes(bytes)).toBe(false);
        expectSame(bytes, `${name} at ${where}`);
      });
    }
  }
  it("lines after the table are handed to the general path and named in its warning", () => {
    const bytes = enc(base.join("\n") + "End of run\nOperator: R. Ilves\n");
    expect(takes(bytes)).toBe(false);
    expectSame(bytes, "trailing lines");
    expect(parseDelimitedText(bytes).warnings.join(" ")).toMatch(/2 line\(s\) after the table were not read/);
  });
});

describe("what the byte-level reader hands over", () => {
  it("each column is one Float64Array of exactly its length (no trailing slack), the channels of a table sharing their times", () => {
    for (const tail of ["\n", "", "\r\n"]) {
      const rows = Array.from({ length: 1000 }, (_, i) => `${i * 2},${1 - i / 2000},${i / 1000}`).join(tail === "\r\n" ? "\r\n" : "\n");
      const bytes = enc(`Time (s),A (A),B (A)${tail === "\r\n" ? "\r\n" : "\n"}${rows}${tail}`);
      expect(takes(bytes)).toBe(true);
      const [a, b] = parseDelimitedText(bytes).series;
      for (const s of [a!, b!]) {
        expect(s.t).toBeInstanceOf(Float64Array);
        expect(s.y).toBeInstanceOf(Float64Array);
        expect([s.t.length, s.y.length, (s.y as Float64Array).buffer.byteLength]).toEqual([1000, 1000, 8000]);
      }
      expect(a!.t).toBe(b!.t);
      expect([a!.t[999], a!.y[999], b!.y[999]]).toEqual([1998, 1 - 999 / 2000, 0.999]);
    }
  });
});

describe("numbers read at byte level are Number()'s own doubles", () => {
  it("200,000 random cells in every written form, bit for bit", () => {
    const rnd = seededRandom(7);
    const cells: string[] = [];
    for (let i = 0; i < 200_000; i++) {
      const mag = Math.pow(10, Math.floor(rnd.uniform() * 60) - 30);
      const v = (rnd.uniform() - 0.5) * mag;
      const digits = 1 + Math.floor(rnd.uniform() * 20);
      const k = i % 5;
      cells.push(
        k === 0
          ? v.toPrecision(digits)
          : k === 1
            ? v.toExponential(Math.min(digits, 20))
            : k === 2
              ? v.toFixed(Math.min(digits, 20))
              : k === 3
                ? String(Math.round(v * 1e6))
                : `${(rnd.uniform() * 1000).toFixed(digits % 8)}e${Math.floor(rnd.uniform() * 50) - 25}`,
      );
    }
    const text = "Time (s),A\n" + cells.map((c, i) => `${i},${c}`).join("\n") + "\n";
    const bytes = enc(text);
    expect(takes(bytes)).toBe(true);
    const r = parseDelimitedText(bytes);
    expect(bits(r.series[0]!.y)).toBe(bits(cells.map(Number)));
  });
});
