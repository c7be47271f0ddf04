// Temperature studies: the stored Ea equals `cli arrhenius` on the same table; changes are versioned with reasons;
// predictions carry their cautions. (The demo runs are invented data: used here only as material to group.)
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { runCli } from "@/lib/cli/main";
import { formatWithUncertainty } from "@/lib/format/number";
import { fitLine } from "@/lib/kinetics";
import { changeStudy, createStudy, getStudyRecord, studyCsv, type StudyGlobal } from "@/lib/studies";
import { freshDb, signInAs } from "./../helpers/db";

let db: Knex;
let analyst: SignedInUser;
let fitIds: number[];

beforeAll(async () => {
  db = await freshDb();
  await seedDemoWhenEmpty(db, new Date(), { runs: true });
  analyst = await signInAs(db, "analyst");
  // The demo's four temperatures (the drifting repeat left out).
  fitIds = (await db("fits as f").join("runs as r", "r.id", "f.run_id").whereNot("r.name", "like", "%drift%").orderBy("r.temperature_c").select("f.id")).map((r) => r.id);
});
afterAll(() => db.destroy());

describe("temperature study", () => {
  it("beside the two-stage result, all curves fitted together: Ea and kref with SEs, per-run k, and the two routes agree within their uncertainties", async () => {
    const s = await createStudy(db, analyst, { name: "Global beside two-stage", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true } });
    const r = (await getStudyRecord(db, analyst.labId, s.id)).results as { ea: { value: number; se: number }; global: StudyGlobal };
    const g = r.global;
    expect(g.available).toBe(true);
    expect(g.converged).toBe(true);
    expect(g.runs).toHaveLength(fitIds.length);
    expect(g.ea!.se).toBeGreaterThan(0);
    // The demo was generated with Ea = 82 kJ/mol (invented): the global fit recovers it within 3 SE, and the two routes
    // agree within their combined uncertainty on these clean runs.
    expect(Math.abs(g.ea!.value! - 82_000)).toBeLessThan(3 * g.ea!.se!);
    expect(g.agreement!.agree).toBe(true);
    expect(Math.abs(g.correlation_ea_kref!)).toBeLessThan(0.95);
    // Each run's residual panel: at most 150 residuals, in time order, within the run's span.
    for (const run of g.runs!) {
      expect(run.residuals!.t.length).toBeGreaterThan(10);
      expect(run.residuals!.t.length).toBeLessThanOrEqual(150);
      expect(run.residuals!.t).toEqual([...run.residuals!.t].sort((a, b) => a - b));
    }
  });

  it("the global fit's k at the target temperature: the Arrhenius form of the CLI contract from its Ea and kref, and it agrees with the two-stage prediction", async () => {
    const s = await createStudy(db, analyst, { name: "Global prediction", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true, target_c: 20 } });
    const r = (await getStudyRecord(db, analyst.labId, s.id)).results as { prediction: { k: number; k_ci95: [number, number] }; global: StudyGlobal };
    const g = r.global;
    const p = g.prediction!;
    // k(T) = kref·exp(−(Ea/R)(1/T − 1/Tref)), T in kelvin (shared/contracts/CLI.md, "global").
    const R = 8.314462618;
    const expected = g.kref!.value! * Math.exp((-g.ea!.value! / R) * (1 / (20 + 273.15) - 1 / (g.tref_c! + 273.15)));
    expect(Math.abs(p.k - expected)).toBeLessThan(1e-9 * expected);
    expect(p.ci95[0]).toBeLessThan(p.k);
    expect(p.ci95[1]).toBeGreaterThan(p.k);
    expect(p.extrapolated).toBe(true);
    expect(p.caution).toMatch(/qualified review/);
    // The two routes' intervals overlap on these clean runs.
    expect(p.ci95[0]).toBeLessThan(r.prediction.k_ci95[1]);
    expect(r.prediction.k_ci95[0]).toBeLessThan(p.ci95[1]);
  });

  it("replicate runs at one temperature: temperatures counted as distinct values, Q10 only between distinct temperatures", async () => {
    // Every demo fit, the drifting 25 °C repeat included: five rate constants at four temperatures.
    const all = (await db("fits").select("id")).map((r) => r.id as number);
    const s = await createStudy(db, analyst, { name: "With a replicate", kind: "temperature", members: all.map((fitId) => ({ fitId })), options: { weighted: true } });
    const r = (await getStudyRecord(db, analyst.labId, s.id)).results as { n: number; temperatures: number; q10: Array<{ from_c: number; to_c: number; q10: number }> };
    expect(r.n).toBe(all.length);
    expect(r.temperatures).toBe(new Set((await db("runs").select("temperature_c")).map((x) => x.temperature_c)).size);
    expect(r.q10).toHaveLength(r.temperatures - 1);
    for (const q of r.q10) expect(q.to_c).toBeGreaterThan(q.from_c);
  });

  it("gives the same Ea, ln A and Eyring parameters as `cli arrhenius` on the same table, to the printed digits", async () => {
    const s = await createStudy(db, analyst, { name: "Corvane blue", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true } });
    const rec = await getStudyRecord(db, analyst.labId, s.id);
    const r = rec.results as { ea: { value: number; se: number }; lnA: { value: number; se: number }; eyring: { dH: { value: number; se: number }; dS: { value: number; se: number } }; n: number };
    expect(r.n).toBe(4);
    const table = ["T (°C),k (1/s),SE", ...rec.members.map((m) => `${m.temperature_used_c},${m.k},${m.se}`)].join("\n");
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "halflight-study-")), "k.csv");
    fs.writeFileSync(file, table);
    const cli = JSON.parse((await runCli(["arrhenius", file, "--json"])).out!);
    const printed = (v: number, se: number) => formatWithUncertainty(v / 1000, se / 1000);
    expect(printed(r.ea.value, r.ea.se)).toBe(printed(cli.ea.value, cli.ea.se));
    expect(formatWithUncertainty(r.lnA.value, r.lnA.se)).toBe(formatWithUncertainty(cli.lnA.value, cli.lnA.se));
    expect(printed(r.eyring.dH.value, r.eyring.dH.se)).toBe(printed(cli.eyring.dH.value, cli.eyring.dH.se));
    expect(formatWithUncertainty(r.eyring.dS.value, r.eyring.dS.se)).toBe(formatWithUncertainty(cli.eyring.dS.value, cli.eyring.dS.se));
    // The demo was generated with Ea = 82 kJ/mol (invented); the study recovers it within its 95 % CI.
    const ci = (rec.results as { ea: { ci95: [number, number] } }).ea.ci95;
    expect(ci[0]).toBeLessThan(82_000);
    expect(ci[1]).toBeGreaterThan(82_000);
    const csv = await studyCsv(db, analyst.labId, s.id);
    expect(csv.text).toMatch(/^Ea,\d+\.\d+,/m);
  });

  it("a changed temperature needs a reason and makes a new version; predictions carry their cautions", async () => {
    const s = await createStudy(db, analyst, { name: "Versioned", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true, target_c: 30 } });
    const members = fitIds.map((fitId, i) => ({ fitId, ...(i === 0 ? { temperature_c: 25.4 } : {}) }));
    await expect(changeStudy(db, analyst, s.id, { members, reason: "x".repeat(3) })).rejects.toThrow(/a reason is required/);
    const v2 = await changeStudy(db, analyst, s.id, { members: fitIds.map((fitId, i) => ({ fitId, ...(i === 0 ? { temperature_c: 25.4, temperature_reason: "calibrated probe read 25.4 °C" } : {}) })), reason: "probe correction" });
    expect(v2.version).toBe(2);
    const rec = await getStudyRecord(db, analyst.labId, v2.id);
    expect(rec.members[0]).toMatchObject({ temperature_used_c: 25.4, temperature_reason: "calibrated probe read 25.4 °C", run_temperature_c: 25 });
    expect(rec.versions.map((v) => v.version)).toEqual([1, 2]);
    const p = (rec.results as { prediction: { caution: string; extrapolated: boolean; t90_s: number; t90_pi95_s: [number, number] } }).prediction;
    expect(p.caution).toMatch(/qualified review.*local regulations/);
    expect(p.extrapolated).toBe(false);
    expect(p.t90_pi95_s[0]).toBeLessThan(p.t90_s);
    expect(p.t90_pi95_s[1]).toBeGreaterThan(p.t90_s);
    const cold = await changeStudy(db, analyst, v2.id, { options: { weighted: true, target_c: 5 }, reason: "storage at 5 °C" });
    const coldRec = await getStudyRecord(db, analyst.labId, cold.id);
    // 5 °C lies 20.4 °C below the lowest member (25.4 °C after the correction).
    expect((coldRec.results as { prediction: { extrapolation_c: number } }).prediction.extrapolation_c).toBeCloseTo(20.4, 10);
    expect((coldRec.results as { prediction: { warning: string } }).prediction.warning).toMatch(/extrapolation/);
    expect(await db("audit_events").where({ action: "study.version_saved" })).toHaveLength(2);
  });

  it("an excess-concentration study gives k2 as the slope of k_obs on [B]0", async () => {
    const excess = [0.01, 0.02, 0.03, 0.04];
    const s = await createStudy(db, analyst, { name: "Excess", kind: "excess", members: fitIds.map((fitId, i) => ({ fitId, excess_mol_l: excess[i] })), options: { weighted: false } });
    const rec = await getStudyRecord(db, analyst.labId, s.id);
    const line = fitLine(excess, rec.members.map((m) => m.k));
    expect((rec.results as { k2: { value: number } }).k2.value).toBeCloseTo(line.slope, 12);
    // Beside it, every curve fitted together with k_obs = k2·[B]0 (the engine's excess form is checked against scipy in
    // kinetics/global.test.ts): each run's k follows the shared k2 exactly.
    const g = (rec.results as { global: StudyGlobal }).global;
    expect(g).toMatchObject({ available: true, form: "excess", converged: true });
    expect(g.k2!.se).toBeGreaterThan(0);
    g.runs!.forEach((r, i) => expect(r.k!).toBeCloseTo(g.k2!.value! * excess[i]!, 12));
  });
});
