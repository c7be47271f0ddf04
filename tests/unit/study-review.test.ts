// Studies are signable records through the same review service as fits: submitted (signed, authored), approved or
// rejected by a reviewer (signed, password asked again), never by their author, with one decision winning under
// concurrent requests; superseded versions cannot be submitted; the queue and the navigation count show them; the PDF
// (read back with poppler's pdftotext, Debian's poppler-utils) carries the plots' axes, the results with their units,
// the prediction's caution, comments, signatures with meanings and the audit events in words.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { reviewQueue, reviewStatus, waitingForMe } from "@/lib/reviews";
import { studyReportPdf } from "@/lib/reports/records";
import { changeStudy, createStudy } from "@/lib/studies";
import { changeLabSettings } from "@/lib/admin/settings";
import { openShareLink, openShareLinkOutside, revokeLink } from "@/lib/sharing";
import { freshDb } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;

let db: Knex;
const as: Record<string, SignedInUser> = {};
const pw = (role: string) => DEMO_USERS.find((u) => u.role === role)!.password;
let fitIds: number[];

async function post(route: "submit" | "decision" | "withdraw" | "comments", id: number, body: unknown) {
  const mod = await import(`@/app/api/studies/[id]/${route}/route`);
  const res = await mod.POST(new Request(`http://halflight.test/api/studies/${id}/${route}`, { method: "POST", body: JSON.stringify(body) }), ctx({ id: String(id) }));
  return { status: res.status, body: await res.json() };
}

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db, new Date(), { runs: true });
  for (const u of DEMO_USERS) as[u.role] = await signInWithPassword(db, u.email, u.password);
  fitIds = (await db("fits as f").join("runs as r", "r.id", "f.run_id").whereNot("r.name", "like", "%drift%").orderBy("r.temperature_c").select("f.id")).map((r) => r.id);
});
beforeEach(() => {
  session.current = as.analyst!;
});
afterAll(() => db.destroy());

describe("a study through review", () => {
  let id: number;

  it("the author submits with the password (signed: authored); it waits in the reviewer's queue and count", async () => {
    id = (await createStudy(db, as.analyst!, { name: "Shelf study of corvane blue", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true, target_c: 5 } })).id;
    expect((await post("submit", id, { password: "not-mine" })).status).toBe(401);
    const r = await post("submit", id, { password: pw("analyst") });
    expect(r.status).toBe(200);
    expect(r.body.state).toBe("submitted");
    const s = await reviewStatus(db, as.analyst!.labId, id, "study");
    expect(s.state).toBe("submitted");
    expect(s.signatures).toMatchObject([{ meaning: "authored", printed_name: as.analyst!.name, void: false }]);
    const queue = await reviewQueue(db, as.reviewer!.labId);
    expect(queue.find((q) => q.object_type === "study" && q.id === id)).toMatchObject({ title: "Shelf study of corvane blue", submitted_by: as.analyst!.name });
    expect(await waitingForMe(db, as.reviewer!)).toBeGreaterThanOrEqual(1);
    expect(await waitingForMe(db, as.analyst!)).toBe(0);
  });

  it("the author cannot approve their own study; a reviewer comments, then approves with the password (signed: approved)", async () => {
    expect((await post("decision", id, { decision: "approved", password: pw("analyst") })).status).toBe(403);
    session.current = as.reviewer!;
    expect((await post("comments", id, { body: "Checked the 40 °C run's window against the raw file." })).status).toBe(201);
    expect((await post("decision", id, { decision: "rejected", password: pw("reviewer") })).status).toBe(422);
    const r = await post("decision", id, { decision: "approved", password: pw("reviewer") });
    expect(r.status).toBe(200);
    const s = await reviewStatus(db, as.reviewer!.labId, id, "study");
    expect(s.state).toBe("approved");
    expect(s.signatures.map((g) => g.meaning)).toEqual(["authored", "approved"]);
    expect((await db("audit_events").where({ object_type: "study" }).whereIn("action", ["study.submitted", "study.approved"]).select("action")).map((a) => a.action)).toEqual(["study.submitted", "study.approved"]);
  });

  it("signed study versions cannot be changed in the database", async () => {
    await expect(db("studies").where({ id }).update({ results: "{}" })).rejects.toThrow();
    await expect(db("signatures").where({ object_type: "study", object_id: id }).delete()).rejects.toThrow();
  });

  it("the PDF carries the plots' axes, results with units, the caution, the comment, the signatures and the audit in words", async () => {
    const pdf = await studyReportPdf(db, as.analyst!.labId, "Larkspur", id);
    const file = path.join(os.tmpdir(), `study-${process.pid}.pdf`);
    fs.writeFileSync(file, pdf.bytes);
    const out = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    if (process.env.KEEP_REPORTS) fs.copyFileSync(file, path.join(process.env.KEEP_REPORTS, "study.pdf"));
    fs.rmSync(file);
    expect(out.status, "pdftotext (Debian's poppler-utils) is needed").toBe(0);
    const text = out.stdout;
    expect(text).toMatch(/Arrhenius plot/);
    expect(text).toMatch(/Eyring plot/);
    expect(text).toMatch(/1000 \/ T \(K⁻¹\)/);
    expect(text).toMatch(/bars ±1 SE/);
    expect(text).toMatch(/Ea = [\d.]+ ± [\d.]+ kJ mol⁻¹/);
    expect(text).toMatch(/ΔH‡ = .* kJ mol⁻¹/);
    expect(text).toMatch(/At 5 °C: k = /);
    expect(text).toMatch(/not release or shelf-life decisions/);
    expect(text).toMatch(/Checked the 40 °C run's window/);
    expect(text).toMatch(/Amara Quist · AUTHORED/);
    expect(text).toMatch(/Rafe Okonkwo · APPROVED/);
    expect(text).toMatch(/Integrity verified/);
    expect(text).toMatch(/All curves fitted together/);
    expect(text).toMatch(/Rafe Okonkwo approved study \d+ version 1/);
    expect(text).not.toMatch(/"study\./);
  });

  it("a share link pins the study version: a member opens it, an outside reviewer only where the lab allows it; it can be revoked", async () => {
    const { POST, GET } = await import("@/app/api/studies/[id]/share/route");
    session.current = as.analyst!;
    const made = await POST(new Request(`http://halflight.test/api/studies/${id}/share`, { method: "POST", body: "{}" }), ctx({ id: String(id) }));
    expect(made.status).toBe(201);
    const { path: linkPath, id: linkId } = (await made.json()) as { path: string; id: number };
    const token = linkPath.split("/").pop()!;
    expect(await openShareLink(db, as.reviewer!, token)).toMatchObject({ object_type: "study", fit_id: id });
    await expect(openShareLinkOutside(db, token)).rejects.toMatchObject({ code: "unauthorized" });
    await changeLabSettings(db, as.admin!, { outside_links: true, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "outside reviewer for the shelf study" });
    expect(await openShareLinkOutside(db, token)).toMatchObject({ object_type: "study", fit_id: id });
    const list = await GET(new Request(`http://halflight.test/api/studies/${id}/share`), ctx({ id: String(id) }));
    expect(((await list.json()) as { links: Array<{ id: number; views: number }> }).links).toMatchObject([{ id: linkId, views: 1 }]);
    await revokeLink(db, as.analyst!, linkId);
    await expect(openShareLink(db, as.reviewer!, token)).rejects.toMatchObject({ code: "gone" });
    const actions = (await db("audit_events").where({ object_type: "study" }).whereLike("action", "share.%").select("action")).map((a) => a.action);
    expect(actions).toEqual(["share.created", "share.viewed", "share.viewed_outside", "share.revoked"]);
  });

  it("a new version is a new draft: the approved one is shown superseded, and the old version cannot be submitted again", async () => {
    const next = await changeStudy(db, as.analyst!, id, { reason: "Target temperature for the cold room", options: { weighted: true, target_c: 8 } });
    expect((await reviewStatus(db, as.analyst!.labId, id, "study")).superseded_by).toMatchObject({ id: next.id });
    expect((await reviewStatus(db, as.analyst!.labId, next.id, "study")).state).toBe("draft");
  });

  it("two reviewers deciding at the same moment: one decision is recorded, the other gets 409", async () => {
    const sid = (await createStudy(db, as.analyst!, { name: "Race study", kind: "temperature", members: fitIds.map((fitId) => ({ fitId })), options: { weighted: true } })).id;
    expect((await post("submit", sid, { password: pw("analyst") })).status).toBe(200);
    session.current = as.reviewer!;
    const [a, b] = await Promise.all([
      post("decision", sid, { decision: "approved", password: pw("reviewer") }),
      post("decision", sid, { decision: "rejected", password: pw("reviewer"), reason: "window too short" }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const s = await reviewStatus(db, as.reviewer!.labId, sid, "study");
    expect(s.signatures).toHaveLength(2);
  });
});
