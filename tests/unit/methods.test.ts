// Methods and calibrations as records: versioned and audited, criteria evaluated on the fits of runs that have a
// method, calibrations converting readings with their numbers checked at save. Standards: Harvey, Analytical
// Chemistry 2.0, Table 5.1 (../shared/reference/CHECKS.md); the kinetics run is the published crystal-violet trace.
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { getFitRecord, saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { AppError } from "@/lib/errors";
import { assignRunMethod, runWavelengthMismatch, calibrationConversion, checkCustomModel, createCalibration, createMethod, getCalibration, getMethod, listMethods, newMethodVersion } from "@/lib/methods";
import { createCalibrationSchema, methodDefinitionSchema } from "@/lib/schemas/methods";
import { freshDb, signInAs } from "./../helpers/db";

let db: Knex;
let dev: SignedInUser;
let analyst: SignedInUser;
const HARVEY = [0, 0.1, 0.2, 0.3, 0.4, 0.5].map((c, i) => ({ concentration: c, absorbance: [0.0, 12.36, 24.83, 35.91, 48.79, 60.42][i]! }));

beforeAll(async () => {
  db = await freshDb();
  await seedDemoWhenEmpty(db);
  dev = await signInAs(db, "method_developer");
  analyst = await signInAs(db, "analyst");
});
afterAll(() => db.destroy());

describe("calibrations", () => {
  it("stores the Harvey standards with the CHECKS.md line, LOD and LOQ, and audits the creation", async () => {
    const input = createCalibrationSchema.parse({ name: "Harvey Table 5.1", analyte: "analyte", concentration_unit: "mg/L", standards: HARVEY, sigma: "residual" });
    const { id } = await createCalibration(db, dev, input);
    const c = await getCalibration(db, dev.labId, id);
    expect(c.results.slope).toBeCloseTo(120.7057, 4);
    expect(c.results.se_slope).toBeCloseTo(0.9641, 4);
    expect(c.results.intercept).toBeCloseTo(0.2086, 4);
    expect(c.results.se_intercept).toBeCloseTo(0.2919, 4);
    expect(c.results.lod).toBeCloseTo(0.01103, 5);
    expect(c.results.loq).toBeCloseTo(0.03341, 5);
    expect(c.results.sigma_source).toBe("residual");
    const ev = await db("audit_events").where({ action: "calibration.created", object_id: String(id) }).first();
    expect(JSON.parse(ev!.new_values!)).toMatchObject({ standards: 6, options: { sigma: "residual", through_origin: false, weighting: "none" } });
  });

  it("is immutable in the database", async () => {
    await expect(db("calibrations").where({ id: 1 }).update({ slope: 1 })).rejects.toThrow(/immutable/);
  });

  it("refuses a falling line and σ from blanks without their SD (422, nothing written)", async () => {
    const before = (await db("calibrations").count({ n: "*" }))[0]!.n;
    const falling = createCalibrationSchema.parse({ name: "Wrong columns", analyte: "x", standards: HARVEY.map((s) => ({ ...s, absorbance: -s.absorbance })) });
    await expect(createCalibration(db, dev, falling)).rejects.toMatchObject({ code: "unprocessable" });
    expect(() => createCalibrationSchema.parse({ name: "No blank SD", analyte: "x", standards: HARVEY, sigma: "blank" })).toThrow(/blanks/);
    expect((await db("calibrations").count({ n: "*" }))[0]!.n).toBe(before);
  });
});

describe("methods", () => {
  let methodId: number;
  let runId: number;
  let seriesId: number;

  it("creates version 1 and audits it", async () => {
    const d = methodDefinitionSchema.parse({
      name: "Crystal violet fade, 590 nm",
      analyte: "crystal violet",
      wavelength_nm: 590,
      models: ["first-order", "linearized"],
      criteria: [{ kind: "r2_min", value: 0.99 }, { kind: "min_points", value: 8 }, { kind: "rel_se_k_max", value: 0.05 }, { kind: "absorbance_window", min: 0, max: 0.1 }],
    });
    const r = await createMethod(db, dev, d);
    methodId = r.id;
    expect(r.version).toBe(1);
    const m = await getMethod(db, dev.labId, r.id);
    expect(m.record_id).toBe(r.id);
    expect(m.definition.criteria).toHaveLength(4);
    expect(await db("audit_events").where({ action: "method.created", object_id: String(r.id) }).first()).toBeTruthy();
  });

  it("a change is a new version with a reason; the old one stays as it was", async () => {
    const cur = await getMethod(db, dev.labId, methodId);
    const next = { ...cur.definition, criteria: [...cur.definition.criteria.filter((c) => c.kind !== "absorbance_window"), { kind: "absorbance_window" as const, min: 0, max: 2 }] };
    const v2 = await newMethodVersion(db, dev, methodId, next, "window widened to the instrument's linear range");
    expect(v2).toMatchObject({ version: 2, record_id: methodId });
    expect((await getMethod(db, dev.labId, methodId)).definition.criteria.find((c) => c.kind === "absorbance_window")).toMatchObject({ max: 0.1 });
    await expect(newMethodVersion(db, dev, methodId, next, "again")).rejects.toMatchObject({ code: "conflict" });
    await expect(newMethodVersion(db, dev, v2.id, next, "same")).rejects.toThrow(/Nothing changed/);
    await expect(db("methods").where({ id: methodId }).update({ name: "renamed" })).rejects.toThrow(/immutable/);
    const list = await listMethods(db, dev.labId, { sort: "name", dir: "asc", page: 1, pageSize: 25 });
    expect(list.rows.find((r) => r.record_id === methodId)).toMatchObject({ version: 2 });
  });

  it("a run ingested with the method gets it; its fit is judged by the newest version, criterion by criterion", async () => {
    const bytes = new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv"));
    const ing = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes, fileName: "crystal-violet-590nm.csv", mapping: { run: { method_id: methodId } } });
    runId = ing.run_id;
    seriesId = ing.series[0]!.id;
    expect(await db("runs").where({ id: runId }).first()).toMatchObject({ method_record_id: methodId, method: "Crystal violet fade, 590 nm" });
    const saved = await saveFit(db, analyst, { runId, seriesId, title: "CV with method", options: { models: ["first-order", "linearized"] } });
    const rec = await getFitRecord(db, analyst.labId, saved.id);
    const ev = rec.results.method_evaluation!;
    expect(ev.method).toMatchObject({ record_id: methodId, version: 2 });
    expect(ev.model).toBe("first-order");
    expect(ev.results.map((r) => r.kind)).toEqual(["r2_min", "min_points", "rel_se_k_max", "absorbance_window"]);
    const fo = rec.results.models.find((m) => m.model === "first-order")!.result;
    expect(ev.results[0]).toMatchObject({ value: fo.r2, pass: fo.r2! >= 0.99 });
    expect(ev.results[1]).toMatchObject({ value: fo.n, pass: true });
    expect((await db("fits").where({ id: saved.id }).first())!.criteria_failed).toBe(ev.failed);
  });

  it("a fit that breaks a criterion fails that criterion only", async () => {
    const saved = await saveFit(db, analyst, { runId, seriesId, title: "CV, four points", options: { models: ["first-order"], window: { from: 0, to: 500 } } });
    const ev = (await getFitRecord(db, analyst.labId, saved.id)).results.method_evaluation!;
    const pts = ev.results.find((r) => r.kind === "min_points")!;
    expect(pts.pass).toBe(false);
    expect(pts.value).toBe(5);
    expect(ev.passed).toBe(false);
  });

  it("assigning a method after ingest is audited with old and new values and a reason", async () => {
    await assignRunMethod(db, analyst, runId, null, "wrong method chosen at upload");
    expect((await db("runs").where({ id: runId }).first())!.method_record_id).toBeNull();
    await assignRunMethod(db, analyst, runId, methodId, "method confirmed with the developer");
    const ev = await db("audit_events").where({ action: "run.method_assigned" }).orderBy("id", "desc").first();
    expect(JSON.parse(ev!.old_values!)).toMatchObject({ method_record_id: null });
    expect(JSON.parse(ev!.new_values!)).toMatchObject({ method_record_id: methodId, method_version: 2 });
    await expect(assignRunMethod(db, analyst, runId, 9999, "no such method")).rejects.toMatchObject({ code: "unprocessable" });
  });

  it("a method for another wavelength is refused without a stated reason, then assigned with one; every fit of the run shows the mismatch", async () => {
    const other = await createMethod(db, dev, methodDefinitionSchema.parse({ name: "Nitrophenolate release, 405 nm", analyte: "4-nitrophenolate", wavelength_nm: 405 }));
    const before = await db("audit_events").where({ action: "run.method_assigned" }).count({ n: "*" });
    const refused = await assignRunMethod(db, analyst, runId, other.id, "wrong pick on purpose").then(() => null, (e: AppError) => e);
    expect(refused?.code).toBe("unprocessable");
    expect(refused?.message).toMatch(/Nitrophenolate release, 405 nm is a method for 405 nm; this run was measured at 590 nm/);
    expect(refused?.issues?.[0]?.path).toBe("wavelengthReason");
    expect(await db("audit_events").where({ action: "run.method_assigned" }).count({ n: "*" })).toEqual(before);
    expect((await db("runs").where({ id: runId }).first())!.method_record_id).toBe(methodId);
    await assignRunMethod(db, analyst, runId, other.id, "checking the cross-over", "isosbestic point check, agreed with QA");
    const ev = await db("audit_events").where({ action: "run.method_assigned" }).orderBy("id", "desc").first();
    expect(JSON.parse(ev!.new_values!).wavelength_mismatch).toEqual({ method_nm: 405, run_nm: 590, reason: "isosbestic point check, agreed with QA" });
    expect(await runWavelengthMismatch(db, analyst.labId, runId)).toEqual({ method: "Nitrophenolate release, 405 nm", method_nm: 405, run_nm: 590 });
    await assignRunMethod(db, analyst, runId, methodId, "back to the 590 nm method");
    expect(await runWavelengthMismatch(db, analyst.labId, runId)).toBeNull();
  });

  it("a calibration conversion must carry the stored numbers; a k of zero order then carries the slope's SE", async () => {
    const { id } = await createCalibration(db, dev, createCalibrationSchema.parse({ name: "CV standards", analyte: "crystal violet", concentration_unit: "µmol/L", standards: [0, 0.2, 0.4, 0.6, 0.8, 1.0].map((c, i) => ({ concentration: c, absorbance: 0.087 * c + [0.001, -0.0008, 0.0005, 0.0002, -0.0006, 0.0004][i]! })) }));
    const cal = await getCalibration(db, dev.labId, id);
    const conv = calibrationConversion(cal);
    await expect(saveFit(db, analyst, { runId, seriesId, options: { models: ["zero-order"], conversion: { ...conv, slope: conv.slope * 1.01 } } })).rejects.toThrow(/do not match calibration/);
    const saved = await saveFit(db, analyst, { runId, seriesId, options: { models: ["zero-order", "first-order"], conversion: conv, window: { from: 0, to: 400 } } });
    const rec = await getFitRecord(db, analyst.labId, saved.id);
    const k0 = rec.results.models.find((m) => m.model === "zero-order")!.result.parameters.find((p) => p.name === "k")!;
    expect(k0.se_with_calibration).toBeCloseTo(Math.abs(k0.value!) * Math.hypot(k0.se! / k0.value!, cal.results.se_slope / cal.results.slope), 15);
    expect(rec.results.models.find((m) => m.model === "first-order")!.result.parameters.find((p) => p.name === "k")!.se_with_calibration).toBeUndefined();
    expect(rec.results.quantity).toBe("concentration");
  });

  it("custom models are checked by parsing and a test fit", () => {
    expect(checkCustomModel({ name: "rise", formula: "a*(1-exp(-k*t))+c", starts: { a: 0.5, k: 0.004, c: 0.02 } }).params).toEqual(["a", "c", "k"]);
    expect(() => checkCustomModel({ name: "broken", formula: "a*(1-exp(-k*t)", starts: {} })).toThrow(/cannot be read/);
    expect(() => checkCustomModel({ name: "no time", formula: "a+b", starts: {} })).toThrow(/time variable/);
    expect(() => checkCustomModel({ name: "overflow", formula: "a*exp(k*t)", starts: { a: 1, k: 5 } })).toThrow(/non-finite/);
  });
});
