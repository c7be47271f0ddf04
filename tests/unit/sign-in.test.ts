// Sign-in: clear refusals, lockout after 5 failures in a row for 15 minutes (21 CFR 11.300), each failure audited.
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { findUserByEmail } from "@/db/queries/users";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { AppError } from "@/lib/errors";
import { signInWithPassword, WRONG_CREDENTIALS } from "@/lib/auth/sign-in";
import { verifyAuditChain } from "@/lib/audit";
import { freshDb } from "../helpers/db";

let db: Knex;
const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
const t0 = new Date("2026-06-01T09:00:00Z");
const minutes = (m: number) => new Date(t0.getTime() + m * 60_000);

beforeEach(async () => {
  db = await freshDb();
  await seedDemoWhenEmpty(db, t0);
});
afterEach(() => db.destroy());

async function actions(): Promise<string[]> {
  return (await db("audit_events").orderBy("id")).map((r) => r.action);
}

describe("signInWithPassword", () => {
  it("signs in each demo user with its lab and role", async () => {
    for (const u of DEMO_USERS) {
      const s = await signInWithPassword(db, u.email.toUpperCase(), u.password, t0);
      expect(s).toMatchObject({ email: u.email, role: u.role, labSlug: "larkspur" });
    }
  });

  it("refuses a wrong password and an unknown e-mail with the same clear message, and audits both", async () => {
    await expect(signInWithPassword(db, analyst.email, "nope", t0)).rejects.toThrow(WRONG_CREDENTIALS);
    await expect(signInWithPassword(db, "nobody@example.org", "nope", t0)).rejects.toThrow(WRONG_CREDENTIALS);
    const failed = await db("audit_events").where({ action: "auth.sign_in_failed" }).orderBy("id");
    expect(failed).toHaveLength(2);
    expect(failed[1]!.actor_label).toBe("nobody@example.org");
  });

  it("locks after five failures in a row, refuses the right password while locked, and opens after 15 minutes", async () => {
    for (let i = 1; i <= 4; i++) {
      await expect(signInWithPassword(db, analyst.email, `wrong-${i}`, minutes(i / 10))).rejects.toThrow(WRONG_CREDENTIALS);
    }
    await expect(signInWithPassword(db, analyst.email, "wrong-5", minutes(0.5))).rejects.toThrow(WRONG_CREDENTIALS);
    expect((await findUserByEmail(db, analyst.email))!.locked_until).toBe(minutes(15.5).toISOString());

    // The right password while locked: refused with the same words as any wrong sign-in (the audit says why).
    await expect(signInWithPassword(db, analyst.email, analyst.password, minutes(10))).rejects.toThrow(WRONG_CREDENTIALS);
    const s = await signInWithPassword(db, analyst.email, analyst.password, minutes(16));
    expect(s.role).toBe("analyst");
    expect((await findUserByEmail(db, analyst.email))!.failed_sign_ins).toBe(0);

    const a = await actions();
    expect(a.filter((x) => x === "auth.sign_in_failed")).toHaveLength(5);
    expect(a).toContain("auth.account_locked");
    expect(a).toContain("auth.sign_in_refused_locked");
    expect(a.at(-1)).toBe("auth.signed_in");
    expect(await verifyAuditChain(db)).toBeNull();
  });

  it("answers a locked account, a disabled account and an unknown e-mail in the same words and with the same code", async () => {
    for (let i = 0; i < 6; i++) await signInWithPassword(db, analyst.email, `wrong-${i}`, t0).catch(() => undefined);
    expect((await findUserByEmail(db, analyst.email))!.locked_until).not.toBeNull();
    await db("users").where({ email: DEMO_USERS.find((u) => u.role === "reviewer")!.email }).update({ disabled: true });
    const answers = [];
    for (const email of [analyst.email, DEMO_USERS.find((u) => u.role === "reviewer")!.email, "nobody@example.org"])
      answers.push(await signInWithPassword(db, email, analyst.password, t0).then(() => null, (e: AppError) => ({ code: e.code, message: e.message })));
    expect(answers[0]).toEqual({ code: "unauthorized", message: WRONG_CREDENTIALS });
    expect(answers[1]).toEqual(answers[0]);
    expect(answers[2]).toEqual(answers[0]);
    expect(await actions()).toContain("auth.sign_in_refused_locked");
  });

  it("counts failures in a row only: a success in between resets the count", async () => {
    for (let i = 0; i < 4; i++) await expect(signInWithPassword(db, analyst.email, "x", t0)).rejects.toThrow();
    await signInWithPassword(db, analyst.email, analyst.password, t0);
    await expect(signInWithPassword(db, analyst.email, "x", t0)).rejects.toThrow(WRONG_CREDENTIALS);
    expect((await findUserByEmail(db, analyst.email))!.locked_until).toBeNull();
  });
});
