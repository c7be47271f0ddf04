// The demo scenario (invented): Larkspur Stability Services, a contract stability lab, follows the colour loss of
// "corvane blue", a fictional dye, at 590 nm and four temperatures. This seed creates the lab and one person per role;
// the ingest work adds its runs as real export files.
import type { Knex } from "knex";
import fs from "node:fs";
import path from "node:path";
import { insertLab, countLabs } from "@/db/queries/labs";
import { listMembershipsOfUser } from "@/db/queries/users";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { saveFit } from "@/lib/fits";
import { createStudy } from "@/lib/studies";
import { ingestExport } from "@/lib/ingest";
import { createCalibration, createMethod } from "@/lib/methods";
import { createCalibrationSchema, methodDefinitionSchema } from "@/lib/schemas/methods";
import { demoFiles } from "./demo-files";
import { insertMembership, insertUser } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/permissions/roles";

export const DEMO_LAB = { slug: "larkspur", name: "Larkspur Stability Services" } as const;

/** Demo accounts only: these passwords are printed in the README and must never guard real data. */
export const DEMO_USERS: ReadonlyArray<{ email: string; name: string; role: Role; password: string }> = [
  { email: "ines.marsh@larkspur.example", name: "Ines Marsh", role: "admin", password: "demo-admin-pass" },
  { email: "teodor.vale@larkspur.example", name: "Teodor Vale", role: "method_developer", password: "demo-method-pass" },
  { email: "amara.quist@larkspur.example", name: "Amara Quist", role: "analyst", password: "demo-analyst-pass" },
  { email: "rafe.okonkwo@larkspur.example", name: "Rafe Okonkwo", role: "reviewer", password: "demo-review-pass" },
];

/** Seeds the demo lab when the database has no lab yet; returns whether it did. With `runs`, the demo's export files
 * (written to fixtures/demo when missing) are ingested through the real parsers, as the analyst. */
export async function seedDemoWhenEmpty(db: Knex, now: Date = new Date(), opts: { runs?: boolean } = {}): Promise<boolean> {
  if ((await countLabs(db)) > 0) return false;
  const hashes = await Promise.all(DEMO_USERS.map((u) => hashPassword(u.password)));
  await db.transaction(async (trx) => {
    const at = now.toISOString();
    const lab = await insertLab(trx, { ...DEMO_LAB, createdAt: at });
    for (const [i, u] of DEMO_USERS.entries()) {
      const user = await insertUser(trx, { email: u.email, displayName: u.name, passwordHash: hashes[i]!, createdAt: at });
      await insertMembership(trx, { userId: user.id, labId: lab.id, role: u.role, createdAt: at });
    }
    await recordAudit(trx, {
      labId: lab.id,
      actorUserId: null,
      actorLabel: "demo seed",
      action: "lab.created",
      objectType: "lab",
      objectId: lab.id,
      newValues: { slug: lab.slug, name: lab.name, members: DEMO_USERS.map((u) => ({ email: u.email, role: u.role })) },
      reason: "demo scenario",
    }, now);
  });
  if (opts.runs) await seedDemoRuns(db);
  return true;
}

export const DEMO_FILES_DIR = path.resolve("fixtures/demo");

async function seedDemoRuns(db: Knex): Promise<void> {
  const lab = await db("labs").where({ slug: DEMO_LAB.slug }).first();
  const analyst = await db("users").where({ email: DEMO_USERS.find((u) => u.role === "analyst")!.email }).first();
  fs.mkdirSync(DEMO_FILES_DIR, { recursive: true });
  const memberships = await listMembershipsOfUser(db, analyst!.id);
  const asAnalyst: SignedInUser = { userId: analyst!.id, email: analyst!.email, name: analyst!.display_name, labId: lab!.id, labSlug: lab!.slug, labName: lab!.name, role: memberships[0]!.role };
  const developer = await db("users").where({ email: DEMO_USERS.find((u) => u.role === "method_developer")!.email }).first();
  const asDeveloper: SignedInUser = { ...asAnalyst, userId: developer!.id, email: developer!.email, name: developer!.display_name, role: "method_developer" };
  // Six invented standards of corvane blue (µmol/L) and the method the stability runs follow.
  const cal = await createCalibration(
    db,
    asDeveloper,
    createCalibrationSchema.parse({
      name: "Corvane blue standards, 590 nm (demo)",
      analyte: "corvane blue",
      concentration_unit: "µmol/L",
      wavelength_nm: 590,
      standards: [0, 2, 4, 6, 8, 10].map((c, i) => ({ concentration: c, absorbance: Number((0.0012 + 0.1231 * c + [0.0009, -0.0011, 0.0006, 0.0013, -0.0008, -0.0004][i]!).toFixed(4)) })),
    }),
  );
  const method = await createMethod(
    db,
    asDeveloper,
    methodDefinitionSchema.parse({
      name: "Corvane blue fade, 590 nm (demo)",
      analyte: "corvane blue",
      wavelength_nm: 590,
      path_length_cm: 1,
      concentration: { kind: "calibration", calibration_id: cal.id },
      models: ["first-order", "linearized"],
      criteria: [
        { kind: "converged" },
        { kind: "r2_min", value: 0.995 },
        { kind: "runs_z_max", value: 2.58 },
        { kind: "rel_se_k_max", value: 0.05 },
        { kind: "min_points", value: 20 },
        { kind: "absorbance_window", min: 0.02, max: 1.5 },
      ],
      notes: "Demo method (invented). Corvane blue is fictional; in a real method, state the reagents' hazards and the disposal route here and follow your lab's safety data sheets.",
    }),
  );
  const studyFits: number[] = [];
  for (const f of demoFiles()) {
    const file = path.join(DEMO_FILES_DIR, f.name);
    if (!fs.existsSync(file)) fs.writeFileSync(file, f.text);
    const stored = await ingestExport(db, {
      labId: lab!.id,
      userId: analyst!.id,
      bytes: new Uint8Array(fs.readFileSync(file)),
      fileName: f.name,
      mapping: { run: { study: "Corvane blue stability (demo)", sample: "corvane blue DEMO-7", method_id: method.record_id } },
    });
    // A saved fit on each run's first channel, made through the same path as the fitting page.
    const s0 = stored.series[0]!;
    const fit = await saveFit(db, asAnalyst, { runId: stored.run_id, seriesId: s0.id, title: `${f.name.replace(/\.[^.]+$/, "")} · ${s0.name}`, options: { models: ["linearized", "first-order"] } });
    if (!f.name.includes("drift")) studyFits.push(fit.id);
  }
  await createStudy(db, asAnalyst, {
    name: "Corvane blue, pH 11: Arrhenius (demo)",
    kind: "temperature",
    members: studyFits.map((fitId) => ({ fitId })),
    options: { weighted: true, target_c: 5 },
  });
}
