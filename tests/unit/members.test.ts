// Lab administration: unlock, deactivate (never delete), reactivate, change a role; each with a reason, each audited.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { changeMember } from "@/lib/admin/members";
import { signInWithPassword, WRONG_CREDENTIALS, type SignedInUser } from "@/lib/auth/sign-in";
import { freshDb, signInAs } from "./../helpers/db";

let db: Knex;
let admin: SignedInUser;
const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
let analystId: number;

beforeAll(async () => {
  db = await freshDb();
  await seedDemoWhenEmpty(db);
  admin = await signInAs(db, "admin");
  analystId = (await db("users").where({ email: analyst.email }).first())!.id;
});
afterAll(() => db.destroy());

describe("member administration", () => {
  it("unlocks a locked account", async () => {
    for (let i = 0; i < 5; i++) await signInWithPassword(db, analyst.email, "wrong").catch(() => undefined);
    await expect(signInWithPassword(db, analyst.email, analyst.password)).rejects.toThrow(WRONG_CREDENTIALS);
    await changeMember(db, admin, analystId, { action: "unlock", reason: "verified by phone" });
    expect((await signInWithPassword(db, analyst.email, analyst.password)).role).toBe("analyst");
  });

  it("deactivates without deleting, and reactivates", async () => {
    await changeMember(db, admin, analystId, { action: "deactivate", reason: "left the lab" });
    await expect(signInWithPassword(db, analyst.email, analyst.password)).rejects.toThrow(WRONG_CREDENTIALS);
    expect(await db("users").where({ id: analystId }).first()).toMatchObject({ email: analyst.email });
    await changeMember(db, admin, analystId, { action: "reactivate", reason: "back from leave" });
    expect((await signInWithPassword(db, analyst.email, analyst.password)).role).toBe("analyst");
  });

  it("changes a role, which counts at the next request, and is audited with old and new values", async () => {
    await changeMember(db, admin, analystId, { action: "role", role: "method_developer", reason: "promoted" });
    expect((await signInWithPassword(db, analyst.email, analyst.password)).role).toBe("method_developer");
    const ev = await db("audit_events").where({ action: "member.role_changed" }).first();
    expect(JSON.parse(ev!.old_values!)).toEqual({ role: "analyst" });
    expect(JSON.parse(ev!.new_values!)).toEqual({ role: "method_developer" });
    expect(ev!.reason).toBe("promoted");
  });

  it("refuses changes to one's own account", async () => {
    await expect(changeMember(db, admin, admin.userId, { action: "role", role: "analyst", reason: "oops" })).rejects.toThrow(/cannot change your own account/);
  });
});
