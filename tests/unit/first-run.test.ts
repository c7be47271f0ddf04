// A new install's first-run page: open only while the database has no lab, and only with the one-time token the
// server printed on its console (its SHA-256 is what is stored). Used once, inside the transaction that creates the
// lab; refused tokens write nothing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { firstRunSetup, issueFirstRunToken, needsFirstRun } from "@/lib/admin/setup";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { freshDb } from "../helpers/db";

let db: Knex;
beforeAll(async () => {
  db = await freshDb();
});
afterAll(() => db.destroy());

const input = { lab: "Harbour Assay Lab", slug: "harbour", adminEmail: "lead@harbour.example", adminName: "T. Wren", password: "a long private passphrase" };
const counts = async () => Promise.all(["labs", "users", "memberships"].map(async (t) => Number((await db(t).count({ n: "*" }))[0]!.n)));

describe("first run", () => {
  it("refuses without the right token, writing nothing; then creates the lab with it, once", async () => {
    expect(await needsFirstRun(db)).toBe(true);
    const token = (await issueFirstRunToken(db))!;
    expect(token).toMatch(/^[A-Za-z0-9_-]{32}$/);
    // Only its hash is stored.
    expect(JSON.stringify(await db("setup_tokens").select())).not.toContain(token);
    await expect(firstRunSetup(db, "not-the-token", input)).rejects.toThrow(/set-up token is not right.*Nothing was written/);
    await expect(firstRunSetup(db, "", input)).rejects.toThrow(/not right/);
    expect(await counts()).toEqual([0, 0, 0]);
    const r = await firstRunSetup(db, token, input);
    expect(r.lab_id).toBeGreaterThan(0);
    expect(await needsFirstRun(db)).toBe(false);
    const me = await signInWithPassword(db, input.adminEmail, input.password);
    expect(me).toMatchObject({ role: "admin", labSlug: "harbour" });
    // The token is spent, and a lab exists: a second use is refused.
    await expect(firstRunSetup(db, token, { ...input, slug: "other", adminEmail: "x@harbour.example" })).rejects.toThrow(/already has a lab/);
    expect(await counts()).toEqual([1, 1, 1]);
    expect(await issueFirstRunToken(db)).toBeNull();
  });

  it("an expired token is refused", async () => {
    const fresh = await freshDb();
    try {
      const token = (await issueFirstRunToken(fresh, new Date("2026-01-01T00:00:00Z")))!;
      await expect(firstRunSetup(fresh, token, input, new Date("2026-01-02T00:00:01Z"))).rejects.toThrow(/expired/);
      expect(Number((await fresh("labs").count({ n: "*" }))[0]!.n)).toBe(0);
    } finally {
      await fresh.destroy();
    }
  });

  it("two first-run submissions with the same token at once: one lab", async () => {
    const fresh = await freshDb();
    try {
      const token = (await issueFirstRunToken(fresh))!;
      const results = await Promise.allSettled([firstRunSetup(fresh, token, input), firstRunSetup(fresh, token, { ...input, slug: "harbour-2", adminEmail: "b@harbour.example" })]);
      expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
      expect(Number((await fresh("labs").count({ n: "*" }))[0]!.n)).toBe(1);
    } finally {
      await fresh.destroy();
    }
  });
});
