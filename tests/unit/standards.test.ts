// Calibration standards read from pasted cells and exported files (lib/methods/standards.ts) with the delimited
// parser's table finder. Only the reading is checked here, so the numbers are invented.
import { describe, expect, it } from "vitest";
import { readStandards } from "@/lib/methods/standards";

describe("readStandards", () => {
  it("spreadsheet cells pasted with tabs, a header line above them", () => {
    const r = readStandards("c (µmol/L)\tA\trep\n0\t0.002\t1\n2\t0.176\t1\n4\t0.351\t2\n");
    expect(r.problems).toEqual([]);
    expect(r.rows).toEqual([
      { concentration: "0", absorbance: "0.002", replicate: "1" },
      { concentration: "2", absorbance: "0.176", replicate: "1" },
      { concentration: "4", absorbance: "0.351", replicate: "2" },
    ]);
  });

  it("a semicolon export with decimal commas and a metadata block; no replicate column means 1", () => {
    const r = readStandards("Instrument;UV-1\nWavelength;590 nm\n\nConc;Abs\n0,0;0,002\n2,5;0,220\n5,0;0,437\n");
    expect(r.problems).toEqual([]);
    expect(r.rows).toEqual([
      { concentration: "0.0", absorbance: "0.002", replicate: "1" },
      { concentration: "2.5", absorbance: "0.220", replicate: "1" },
      { concentration: "5.0", absorbance: "0.437", replicate: "1" },
    ]);
  });

  it("a line that is not a standard is named by its line number; the others are kept", () => {
    const r = readStandards("c,A\n0,0.002\n2,n/a\n4,0.351\n");
    expect(r.rows.map((x) => x.concentration)).toEqual(["0", "4"]);
    expect(r.problems).toEqual([`Line 3: "2 n/a" is not a concentration and an absorbance.`]);
  });

  it("text without a table says so", () => {
    const r = readStandards("standards to follow\n");
    expect(r.rows).toEqual([]);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatch(/table of numbers|only one column/);
  });
});
