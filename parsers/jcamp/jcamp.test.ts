// JCAMP-DX decoding against Robert J. Lancashire's public-domain test files (parsers/jcamp/fixtures, copied byte for
// byte from ../shared/reference/jcamp with its README, which lists the decoded facts asserted here).
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { decodeJcamp, jcampParser } from "./index";
import { ParseError, type ParsedExport } from "../types";

const dir = path.join(__dirname, "fixtures");
const read = (f: string) => fs.readFileSync(path.join(dir, f));
const decode = (f: string) => decodeJcamp(read(f).toString("latin1"));
const sum = (a: number[]) => a.reduce((s, v) => s + v, 0);

describe("group A: o01 (AFFN), o03 (PAC), o04 (SQZ), o05 (DIF + DUP) decode to the same array", () => {
  const all = ["o01.jdx", "o03.jdx", "o04.jdx", "o05.jdx"].map((f) => ({ f, d: decode(f) }));
  for (const { f, d } of all) {
    it(`${f}: 8192 points, first/last raw Y, sum, min and max where the README says`, () => {
      expect(d.rawY).toHaveLength(8192);
      expect(d.rawY[0]).toBe(37);
      expect(d.y[0]).toBeCloseTo(46.894022, 6);
      expect(d.rawY.at(-1)).toBe(-1);
      expect(sum(d.rawY)).toBe(212884);
      expect(sum(d.y)).toBeCloseTo(269810.458904, 4);
      const min = Math.min(...d.rawY),
        max = Math.max(...d.rawY);
      expect([min, d.rawY.indexOf(min)]).toEqual([-262, 4660]);
      expect([max, d.rawY.indexOf(max)]).toEqual([32000, 7014]);
      expect(d.x[0]).toBeCloseTo(2391.297363, 6);
      expect(d.x.at(-1)).toBeCloseTo(-402.202637, 6);
    });
  }
  it("o05 holds 150 Y-checks", () => {
    expect(all[3]!.d.yChecks).toBe(150);
  });
  it("all four give the identical array", () => {
    for (const { d } of all.slice(1)) expect(d.rawY).toEqual(all[0]!.d.rawY);
  });
});

describe("group B: sqzdupd1.jdx (SQZ + DUP, IR transmittance)", () => {
  const d = decode("sqzdupd1.jdx");
  it("18669 points with the README's first/last, sum, min and max", () => {
    expect(d.rawY).toHaveLength(18669);
    expect(d.rawY[0]).toBe(21399);
    expect(d.y[0]).toBeCloseTo(0.982870257537, 10);
    expect(d.rawY.at(-1)).toBe(27542);
    expect(sum(d.rawY)).toBe(382332693);
    expect(sum(d.y)).toBeCloseTo(17560.794076, 4);
    expect(d.rawY.filter((v) => v === 0)).toHaveLength(213);
    expect(d.rawY.indexOf(0)).toBe(16831);
    expect(d.rawY.indexOf(32767)).toBe(18555);
    expect(d.yChecks).toBe(0);
  });
});

describe("the JCAMP-DX parser for time series", () => {
  it("is sniffed with high confidence", () => {
    expect(jcampParser.sniff(read("o01.jdx"), "o01.jdx")).toBeGreaterThan(0.9);
  });
  it("refuses a spectrum: its XUNITS are not a time", () => {
    const r = jcampParser.parse(read("o03.jdx"), "o03.jdx");
    expect(r).toBeInstanceOf(ParseError);
    expect((r as ParseError).message).toMatch(/##XUNITS= is "HZ": this table is not a time series/);
    expect((r as ParseError).line).toBe(26);
  });
  it("reads an (XY..XY) kinetics table in minutes, with YFACTOR, wavelength, path length and temperature", () => {
    const r = jcampParser.parse(read("cv-kinetics.jdx"), "cv-kinetics.jdx") as ParsedExport;
    expect(r).not.toBeInstanceOf(ParseError);
    const s = r.series[0]!;
    expect(s.quantity).toBe("absorbance");
    expect(s.t).toEqual([0, 1, 3, 5, 7, 9, 11, 13, 15].map((m) => m * 60));
    // The crystal-violet readings (CHECKS.md), stored ×1000 with YFACTOR 0.001.
    [1.2, 0.905, 0.526, 0.317, 0.2, 0.133, 0.094, 0.071, 0.058].forEach((a, i) => expect(s.y[i]).toBeCloseTo(a, 12));
    expect(r.metadata).toMatchObject({ wavelength_nm: 590, path_length_cm: 1, temperature_c: 25 });
  });
  it("names the line of a character that is not JCAMP-DX data", () => {
    const text = read("cv-kinetics.jdx").toString("latin1").replace("5, 317", "5, 3!7");
    const r = jcampParser.parse(new TextEncoder().encode(text), "x.jdx");
    expect(r).toBeInstanceOf(ParseError);
    expect((r as ParseError).line).toBe(16);
  });
});
