// The delimited-text parser. Fixtures (written by fixtures/make_fixtures.py) lay out one published data set, the
// crystal-violet fading readings quoted in ../shared/reference/CHECKS.md (public Colby College course page), in the
// shapes instrument exports take; each good file must give back exactly those readings.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseExport, ParseError, type ParsedExport } from "@/parsers";
import { delimitedParser } from "./index";

const dir = path.join(__dirname, "fixtures");
const read = (f: string) => new Uint8Array(fs.readFileSync(path.join(dir, f)));
const T = [0, 1, 3, 5, 7, 9, 11, 13, 15].map((m) => m * 60);
const A = [1.2, 0.905, 0.526, 0.317, 0.2, 0.133, 0.094, 0.071, 0.058];

function ok(f: string): ParsedExport {
  const r = delimitedParser.parse(read(f), f);
  if (r instanceof ParseError) throw new Error(`${f}: ${r.message}`);
  return r;
}

function expectCv(s: { t: ArrayLike<number>; y: ArrayLike<number> }, tol = 12) {
  expect(Array.from(s.t)).toEqual(T);
  Array.from(s.y).forEach((v, i) => expect(v).toBeCloseTo(A[i]!, tol));
}

describe("good exports", () => {
  it("semicolon, decimal comma, key;value metadata, path length in mm", () => {
    const r = ok("cv-semicolon-decimal-comma.csv");
    expectCv(r.series[0]!);
    expect(r.metadata).toMatchObject({ wavelength_nm: 590, path_length_cm: 1, temperature_c: 24.6, Instrument: "Spectrophotometer" });
    expect(r.series[0]).toMatchObject({ name: "Abs", quantity: "absorbance", unit: "AU" });
  });
  it("tab, # comments, mm:ss times, absorbance declared in metadata", () => {
    const r = ok("cv-tab-mmss.txt");
    expectCv(r.series[0]!);
    expect(r.series[0]!.name).toBe("Cell 1");
    expect(r.metadata.wavelength_nm).toBe(590);
    expect(r.metadata.operator).toBe("A. Quist");
    expect(r.warnings).toEqual([]);
  });
  it("%T with quoted headers and CRLF: converted with A = 2 − log10(%T)", () => {
    const r = ok("cv-percent-t.csv");
    expect(r.series[0]).toMatchObject({ quantity: "transmittance-converted absorbance", unit: "AU", metadata: { wavelength_nm: 590 } });
    expectCv(r.series[0]!, 9);
  });
  it("clock times of day crossing midnight, two cells, skipped over-range and empty cells listed by line", () => {
    const r = ok("cv-clock-midnight.csv");
    expect(r.series).toHaveLength(2);
    expectCv(r.series[0]!);
    const c2 = r.series[1]!;
    expect(c2.skipped_lines).toEqual([3, 7]);
    // Each skipped cell named for what it is: the instrument's over-range marker, an empty cell.
    expect(r.warnings).toContain(`"Cell 2 (A)": 1 over-range marker ("OVER": the reading was beyond the instrument's range) skipped, line 3.`);
    expect(r.warnings).toContain(`"Cell 2 (A)": 1 empty cell skipped, line 7.`);
    expect(c2.t).toEqual(T.filter((_, i) => i !== 0 && i !== 4));
    expect(r.warnings.join(" ")).toMatch(/clock times of day/);
    expect(r.metadata.temperature_c).toBe(25);
  });
  it("UTF-16 with BOM, whitespace-separated, time unit from a metadata line, temperature in K", () => {
    const r = ok("cv-utf16-whitespace.txt");
    expectCv(r.series[0]!);
    expect(r.metadata.temperature_c).toBeCloseTo(25, 12);
  });
  it("ISO 8601 time stamps with a UTF-8 BOM count from the first row", () => {
    expectCv(ok("cv-iso.csv").series[0]!);
  });
  it("a time column with no unit is taken as seconds, and a warning says so", () => {
    const r = ok("cv-no-time-unit.csv");
    expectCv(r.series[0]!);
    expect(r.warnings.join(" ")).toMatch(/no unit anywhere; its numbers were taken as seconds/);
  });
  it("relative mm:ss keeps its origin: a first reading at 00:30 is t = 30", () => {
    const r = delimitedParser.parse(new TextEncoder().encode("Time,A\n00:30,1.0\n01:30,0.8\n"), "x.csv") as ParsedExport;
    expect(r.series[0]!.t).toEqual([30, 90]);
  });
  it("equal successive times and times below zero are accepted", () => {
    const r = delimitedParser.parse(new TextEncoder().encode("Time (s),A\n-5,1.0\n0,0.9\n0,0.91\n5,0.8\n"), "x.csv") as ParsedExport;
    expect(Array.from(r.series[0]!.t)).toEqual([-5, 0, 0, 5]);
  });
});

describe("refused exports: a clear message naming the line", () => {
  const cases: Array<[string, RegExp, number | undefined]> = [
    ["bad-empty.csv", /The file is empty/, undefined],
    ["bad-binary.bin", /binary, not a text export/, undefined],
    ["bad-header-only.csv", /a header row but no data rows/, 2],
    ["bad-half-number.csv", /"A" holds "0\.5x26", which is not a number/, 4],
    ["bad-backwards.csv", /the time goes backwards/, 5],
    ["bad-ragged.csv", /the row has 2 cells but the header has 3/, 4],
    ["bad-one-column.csv", /only one column/, 2],
    ["bad-declared-encoding.csv", /declares its encoding as "UTF-16" but its bytes are UTF-8/, 1],
    ["bad-metadata-only.txt", /3 lines of metadata but no table of numbers/, undefined],
    ["bad-channel-no-numbers.csv", /the channel "B" has no numbers at all/, 1],
  ];
  for (const [f, message, line] of cases) {
    it(f, () => {
      const r = parseExport(read(f), f);
      expect(r).toBeInstanceOf(ParseError);
      expect((r as ParseError).message).toMatch(message);
      expect((r as ParseError).line).toBe(line);
      if (line) expect((r as ParseError).message).toMatch(new RegExp(`^line ${line}: `));
    });
  }
});

describe("sniffing", () => {
  it("prefers the delimited parser for CSV and the JCAMP-DX parser for .jdx", async () => {
    const { rankParsers } = await import("@/parsers");
    expect(rankParsers(read("cv-percent-t.csv"), "cv-percent-t.csv")[0]!.parser.name).toBe("delimited");
    const jdx = new Uint8Array(fs.readFileSync(path.join(__dirname, "../jcamp/fixtures/cv-kinetics.jdx")));
    expect(rankParsers(jdx, "cv-kinetics.jdx")[0]!.parser.name).toBe("jcamp-dx");
  });
});
