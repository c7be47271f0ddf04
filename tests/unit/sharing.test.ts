// Share links (token hashed, pinned version, 410 when revoked or expired, views logged), review mail, and the PDF
// report's text (read back with poppler's pdftotext, Debian's poppler-utils).
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { insertLab } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { changeLabSettings } from "@/lib/admin/settings";
import { hashPassword } from "@/lib/auth/password";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { fitReportPdf } from "@/lib/reports/records";
import { addComment, decideFit, submitFit } from "@/lib/reviews";
import { openShareLink, openShareLinkOutside } from "@/lib/sharing";
import { freshDb } from "./../helpers/db";
import { testMailSink } from "./../helpers/mail";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;

let db: Knex;
const as: Record<string, SignedInUser> = {};
const pw = (role: string) => DEMO_USERS.find((u) => u.role === role)!.password;
let sink: Awaited<ReturnType<typeof testMailSink>>;

async function share(fitId: number, body: unknown) {
  const { POST } = await import("@/app/api/fits/[id]/share/route");
  const res = await POST(new Request(`http://halflight.test/api/fits/${fitId}/share`, { method: "POST", body: JSON.stringify(body) }), ctx({ id: String(fitId) }));
  return { status: res.status, body: await res.json() };
}
async function open(token: string) {
  const { GET } = await import("@/app/api/share/[token]/route");
  const res = await GET(new Request(`http://halflight.test/api/share/${token}`), ctx({ token }));
  return { status: res.status, body: await res.json() };
}
const raw = () => fs.readdirSync(sink.dir).filter((f) => f.endsWith(".eml")).sort().map((f) => fs.readFileSync(path.join(sink.dir, f)));
/** Each message decoded (headers may be RFC 2047-encoded) as "To: …\nSubject: …\n\ntext". */
async function decoded(from = 0): Promise<string[]> {
  return Promise.all(raw().slice(from).map(async (b) => {
    const m = await simpleParser(b);
    const to = Array.isArray(m.to) ? m.to.map((x) => x.text).join(", ") : (m.to?.text ?? "");
    return `To: ${to}\nSubject: ${m.subject ?? ""}\n\n${m.text ?? ""}`;
  }));
}

beforeAll(async () => {
  sink = await testMailSink("mail");
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db, new Date(), { runs: true });
  for (const u of DEMO_USERS) as[u.role] = await signInWithPassword(db, u.email, u.password);
});
beforeEach(() => {
  session.current = as.analyst!;
});
afterAll(async () => {
  await sink.stop();
  await db.destroy();
});

describe("share links", () => {
  it("go to outside reviewers only where the lab's settings allow it", async () => {
    const refused = await share(1, { recipient: "qa.partner@larkspur.example" });
    expect(refused.status).toBe(403);
    expect(refused.body.error.message).toMatch(/not a member .* outside reviewers/);
    await changeLabSettings(db, as.admin!, { outside_links: true, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "partner QA reviews this study" });
  });

  it("opens read-only without an account only while the lab allows outside reviewers; each opening is audited", async () => {
    const s = await share(1, { recipient: "qa.partner@larkspur.example" });
    const token = s.body.path.split("/").pop();
    const opened = await openShareLinkOutside(db, token);
    expect(opened).toMatchObject({ fit_id: 1, lab_id: as.analyst!.labId, recipient: "qa.partner@larkspur.example" });
    const ev = await db("audit_events").where({ action: "share.viewed_outside" }).orderBy("id", "desc").first();
    expect(ev).toMatchObject({ actor_user_id: null, actor_label: `outside reviewer via link ${s.body.id} (qa.partner@larkspur.example)` });
    await changeLabSettings(db, as.admin!, { outside_links: false, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "partner review over" });
    await expect(openShareLinkOutside(db, token)).rejects.toMatchObject({ code: "unauthorized" });
    await changeLabSettings(db, as.admin!, { outside_links: true, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "partner QA again" });
    await expect(openShareLinkOutside(db, "A".repeat(32))).rejects.toMatchObject({ code: "not_found" });
  });

  it("stores only the token's hash, opens the pinned version and logs each view", async () => {
    const s = await share(1, { recipient: "qa.partner@larkspur.example" });
    expect(s.status).toBe(201);
    const token = s.body.path.split("/").pop();
    expect(token.length).toBeGreaterThanOrEqual(32); // 24 random bytes, base64url
    const row = await db("share_links").where({ id: s.body.id }).first();
    expect(JSON.stringify(row)).not.toContain(token);
    const o = await open(token);
    expect(o).toMatchObject({ status: 200, body: { fit_id: 1 } });
    expect(await db("share_views").where({ share_link_id: s.body.id })).toHaveLength(1);
    expect((await decoded()).some((m) => m.includes("To: qa.partner@larkspur.example") && m.includes(`http://halflight.test/share/${token}`))).toBe(true);
  });

  it("a revoked link answers 410 with a plain message", async () => {
    const s = await share(1, {});
    const token = s.body.path.split("/").pop();
    const { POST } = await import("@/app/api/share-links/[id]/revoke/route");
    await POST(new Request("http://halflight.test/x", { method: "POST" }), ctx({ id: String(s.body.id) }));
    const o = await open(token);
    expect(o.status).toBe(410);
    expect(o.body.error.message).toMatch(/This share link was revoked on .* Ask the sender for a new one\./);
  });

  it("an expired link answers 410", async () => {
    const s = await share(1, { days: 1 });
    const token = s.body.path.split("/").pop();
    await expect(openShareLink(db, as.analyst!, token, new Date(Date.now() + 2 * 86_400_000))).rejects.toMatchObject({ status: 410, message: expect.stringMatching(/expired on/) });
  });

  it("a member of another lab gets 404", async () => {
    const s = await share(1, {});
    const now = new Date().toISOString();
    const lab = await insertLab(db, { slug: "elsewhere", name: "Elsewhere", createdAt: now });
    const u = await insertUser(db, { email: "out@elsewhere.example", displayName: "Out Sider", passwordHash: await hashPassword("elsewhere-123"), createdAt: now });
    await insertMembership(db, { userId: u.id, labId: lab.id, role: "reviewer", createdAt: now });
    session.current = await signInWithPassword(db, "out@elsewhere.example", "elsewhere-123");
    expect((await open(s.body.path.split("/").pop())).status).toBe(404);
    // Listing that record's links and replying to its comments answer 404 too, never an empty list or a 201.
    const { GET } = await import("@/app/api/fits/[id]/share/route");
    expect((await GET(new Request("http://halflight.test/api/fits/1/share"), ctx({ id: "1" }))).status).toBe(404);
    session.current = as.analyst!;
    const { POST } = await import("@/app/api/fits/[id]/comments/route");
    const comment = async (id: number, body: unknown) => (await POST(new Request(`http://halflight.test/api/fits/${id}/comments`, { method: "POST", body: JSON.stringify(body) }), ctx({ id: String(id) }))).status;
    expect(await comment(1, { body: "the residuals look clean" })).toBe(201);
    const own = (await db("comments").where({ object_id: 1 }).orderBy("id", "desc").first())!;
    expect(await comment(1, { body: "agreed", parentId: own.id })).toBe(201);
    const before = Number((await db("comments").count({ n: "*" }))[0]!.n);
    // A parent on another version (or in another lab) is not found.
    expect(await comment(2, { body: "a reply to a comment elsewhere", parentId: own.id })).toBe(404);
    expect(Number((await db("comments").count({ n: "*" }))[0]!.n)).toBe(before);
  });
});

describe("review mail and the PDF report", () => {
  it("submitting mails each reviewer a pinned link; the PDF holds the signature meaning, the name and the record hash", async () => {
    const before = raw().length;
    await submitFit(db, as.analyst!, 2, pw("analyst"));
    const fresh = await decoded(before);
    const toReviewer = fresh.find((m) => m.includes("To: rafe.okonkwo@larkspur.example"))!;
    expect(toReviewer).toMatch(/Subject: Review requested: corvane-blue-30C/);
    expect(toReviewer).toMatch(/http:\/\/halflight\.test\/share\/[A-Za-z0-9_-]{32}/);
    await addComment(db, as.reviewer!, 2, "Residuals random; Ωmega check at 25 °C ± 0.1 agrees.");
    await decideFit(db, as.reviewer!, 2, { decision: "approved", password: pw("reviewer") });
    expect((await decoded(before)).some((m) => m.includes("To: amara.quist@larkspur.example") && m.includes("Subject: Approved:"))).toBe(true);

    const pdf = await fitReportPdf(db, as.analyst!.labId, as.analyst!.labName, 2);
    const file = path.join(sink.dir, "..", `report-${Date.now()}.pdf`);
    fs.writeFileSync(file, pdf.bytes);
    const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    expect(text.status, "pdftotext (Debian's poppler-utils) is needed").toBe(0);
    const hash = (await db("fits").where({ id: 2 }).first())!.content_hash;
    expect(text.stdout).toContain("Rafe Okonkwo · APPROVED");
    expect(text.stdout).toContain("Amara Quist · AUTHORED");
    expect(text.stdout.replace(/\s+/g, "")).toContain(hash);
    // The record's audit events in sentences.
    expect(text.stdout).toMatch(/Rafe Okonkwo approved fit record 2 version 1 \(state: submitted → approved\)/);
    // The demo run follows the demo method: its verdict per criterion is in the report.
    expect(text.stdout).toContain("Method criteria: all met");
    expect(text.stdout).toMatch(/PASS\s+the fit converged: yes/);
    expect(text.stdout).toMatch(/PASS\s+at least 20 points fitted: 61/);
    // Units and symbols as on screen (the app's own typeface embedded), the plot's axes, and the comment with its author.
    expect(text.stdout).toMatch(/k = [\d.]+ ± [\d.]+ s⁻¹/);
    expect(text.stdout).toMatch(/t \((s|min)\)/);
    expect(text.stdout).toMatch(/residual/);
    expect(text.stdout).toMatch(/Rafe Okonkwo: Residuals random; Ωmega check at 25 °C ± 0\.1 agrees\./);
    expect(text.stdout).not.toMatch(/s\^-1/);
  });
});
