// Integrity as a reviewer and an administrator see it: a record says it verified; after its stored results are changed
// behind the application's back (the guard dropped first, as only someone with the database file could), the record
// shows a tamper warning and the administrator's integrity check names it.
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const dbFile = inject("dbFile");
const closers: Array<() => Promise<void>> = [];
let analyst: Page, admin: Page;
let fitId: number;

beforeAll(async () => {
  const a = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "analyst")!);
  const d = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "admin")!);
  closers.push(a.close, d.close);
  analyst = a.page;
  admin = d.page;
  const db = new Database(dbFile, { readonly: true });
  const s = db.prepare("SELECT id, run_id FROM series ORDER BY id LIMIT 1").get() as { id: number; run_id: number };
  db.close();
  const res = await analyst.request.post(`${baseURL}/api/fits`, {
    data: { runId: s.run_id, seriesId: s.id, title: "integrity probe", options: { models: ["first-order"] } },
    headers: { origin: baseURL },
  });
  expect(res.status()).toBe(201);
  fitId = (await res.json()).id;
});
afterAll(async () => {
  for (const c of closers) await c();
});

describe("integrity", () => {
  it("a record says its integrity was verified; the administrator's check finds nothing", async () => {
    await analyst.goto(`${baseURL}/fits/${fitId}`);
    const note = analyst.getByTestId("integrity");
    await expect.poll(() => note.getAttribute("data-ok")).toBe("true");
    await expect.poll(() => note.textContent()).toMatch(/Integrity verified/);
    await admin.goto(`${baseURL}/admin/audit`);
    await admin.getByRole("button", { name: "Check integrity" }).click();
    await expect.poll(() => admin.getByTestId("integrity-result").textContent(), { timeout: 30_000 }).toMatch(/Integrity verified: \d+ audit rows and \d+ record versions recomputed/);
  });

  it("results changed behind the application's back: a tamper warning on the record and in the check", async () => {
    const db = new Database(dbFile);
    db.exec("DROP TRIGGER IF EXISTS fits_immutable");
    const row = db.prepare("SELECT results FROM fits WHERE id = ?").get(fitId) as { results: string };
    const results = JSON.parse(row.results);
    const k = results.models[0].result.parameters.find((p: { name: string }) => p.name === "k");
    k.value *= 0.8;
    db.prepare("UPDATE fits SET results = ? WHERE id = ?").run(JSON.stringify(results), fitId);
    db.close();

    await analyst.goto(`${baseURL}/fits/${fitId}`);
    const note = analyst.getByTestId("integrity");
    await expect.poll(() => note.getAttribute("data-ok")).toBe("false");
    await expect.poll(() => note.textContent()).toMatch(/Tamper warning.*no longer give the version's content hash/s);
    await analyst.screenshot({ path: path.join(artifacts, "record-tamper-warning.png"), fullPage: true });

    await admin.goto(`${baseURL}/admin/audit`);
    await admin.getByRole("button", { name: "Check integrity" }).click();
    const result = admin.getByTestId("integrity-result");
    await expect.poll(() => result.textContent(), { timeout: 30_000 }).toMatch(new RegExp(`Tampering found.*fit ${fitId}:`, "s"));
    await admin.screenshot({ path: path.join(artifacts, "integrity-check.png"), fullPage: true });
  });
});
