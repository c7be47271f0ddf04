// The unit of every parameter of every model, from the model table, on the record's CSV and in the PDF.
// Expected units: common practice (IUPAC Green Book, 3rd ed., section 2.12: a rate constant of order n has units
// (concentration)^(1−n) time⁻¹), written out here by hand for absorbance (AU) and Beer–Lambert concentration.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { fitParametersCsv, saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { fitUnits, MODELS, parameterUnit } from "@/lib/kinetics/models";
import { fitReportPdf } from "@/lib/reports/records";
import { freshDb, signInAs } from "../../helpers/db";

const EXPECTED: Record<string, Record<string, [string, string]>> = {
  // model → parameter → [absorbance, mol L⁻¹]
  "first-order": { a0: ["AU", "mol L⁻¹"], ainf: ["AU", "mol L⁻¹"], k: ["s⁻¹", "s⁻¹"] },
  linearized: { k: ["s⁻¹", "s⁻¹"], a0: ["AU", "mol L⁻¹"], ainf: ["AU", "mol L⁻¹"] },
  guggenheim: { k: ["s⁻¹", "s⁻¹"], amplitude: ["AU", "mol L⁻¹"] },
  "kezdy-swinbourne": { k: ["s⁻¹", "s⁻¹"], ainf: ["AU", "mol L⁻¹"] },
  "zero-order": { a0: ["AU", "mol L⁻¹"], k: ["AU s⁻¹", "mol L⁻¹ s⁻¹"] },
  "second-order": { a0: ["AU", "mol L⁻¹"], k: ["AU⁻¹ s⁻¹", "L mol⁻¹ s⁻¹"] },
  biexponential: { a1: ["AU", "mol L⁻¹"], k1: ["s⁻¹", "s⁻¹"], a2: ["AU", "mol L⁻¹"], k2: ["s⁻¹", "s⁻¹"], c: ["AU", "mol L⁻¹"] },
};

describe("the model table gives each parameter its unit", () => {
  it("covers every built-in model and no other", () => {
    expect(MODELS.filter((m) => m.family !== "formula").map((m) => m.id).sort()).toEqual(Object.keys(EXPECTED).sort());
  });
  for (const m of MODELS.filter((x) => x.family !== "formula"))
    it(`${m.id}: ${m.params.map((p) => p.name).join(", ")}`, () => {
      expect(m.params.map((p) => p.name).sort()).toEqual(Object.keys(EXPECTED[m.id]!).sort());
      for (const p of m.params) {
        const [abs, conc] = EXPECTED[m.id]![p.name]!;
        expect(parameterUnit(m.id, p.name, fitUnits("absorbance")), `${p.name} in AU`).toBe(abs);
        expect(parameterUnit(m.id, p.name, fitUnits("concentration", { kind: "beer-lambert" })), `${p.name} in mol L⁻¹`).toBe(conc);
        expect(parameterUnit(m.id, p.name, { y: "AU", t: "min" }), `${p.name} per minute`).toBe(abs.replace("s⁻¹", "min⁻¹"));
      }
    });
  it("an own formula's parameters have no unit the engine could know", () => {
    expect(parameterUnit("formula", "b1", fitUnits("absorbance"))).toBeNull();
  });
  it("a calibration's own unit carries into k", () => {
    expect(parameterUnit("second-order", "k", fitUnits("concentration", { kind: "calibration", unit: "µmol/L" }))).toBe("(µmol/L)⁻¹ s⁻¹");
    expect(parameterUnit("zero-order", "k", fitUnits("concentration", { kind: "calibration", unit: "mg/L" }))).toBe("mg/L s⁻¹");
  });
});

describe("on a saved record: CSV and PDF", () => {
  let db: Knex;
  let analyst: SignedInUser;
  let fitId: number;
  beforeAll(async () => {
    db = await freshDb();
    setDb(db);
    await seedDemoWhenEmpty(db);
    analyst = await signInAs(db, "analyst");
    const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: "crystal-violet-590nm.csv" });
    const models = Object.keys(EXPECTED);
    const saved = await saveFit(db, analyst, {
      runId: r.run_id,
      seriesId: r.series[0]!.id,
      title: "units",
      options: { models, interval: 600, conversion: { kind: "beer-lambert", epsilon: 87000, pathLengthCm: 1 } },
    });
    fitId = saved.id;
  });
  afterAll(() => db.destroy());

  it("the parameters CSV has every parameter's unit in mol L⁻¹", async () => {
    const csv = (await fitParametersCsv(db, analyst.labId, fitId)).text.split("\n");
    expect(csv[1]!.split(",").slice(0, 4)).toEqual(["model", "parameter", "unit", "value"]);
    const rows = csv.slice(2).filter(Boolean).map((l) => l.split(","));
    for (const [model, params] of Object.entries(EXPECTED))
      for (const [name, [, conc]] of Object.entries(params)) {
        const row = rows.find((r) => r[0] === model && r[1] === name);
        expect(row, `${model} ${name}`).toBeDefined();
        expect(row![2], `${model} ${name}`).toBe(conc);
      }
  });

  it("the PDF prints each parameter with its unit (pdftotext, poppler-utils)", async () => {
    const pdf = await fitReportPdf(db, analyst.labId, "Larkspur", fitId);
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "halflight-units-")), "r.pdf");
    fs.writeFileSync(file, pdf.bytes);
    const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout.replace(/\s+/g, " ");
    // The report embeds the app's own typeface: units print as on screen (superscript minus one), never as ^-1.
    expect(text).toMatch(/second-order: [^]*? k = [^=]*? L mol⁻¹ s⁻¹ 95 % CI/);
    expect(text).toMatch(/zero-order: [^]*? k = [^=]*? mol L⁻¹ s⁻¹ 95 % CI/);
    expect(text).toMatch(/first-order: [^]*? k = [0-9.]+ ± [0-9.]+ s⁻¹ 95 % CI/);
    expect(text).toMatch(/biexponential: [^]*? k1 = [0-9.]+ ± [0-9.]+ s⁻¹ [^]*? c = [^=]*? mol L⁻¹ 95 % CI/);
    expect(text).not.toMatch(/\^-1/);
  });
});
