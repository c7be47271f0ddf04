// Every route handler x every role (and signed out): 401 signed out, 403 without the permission, success with it.
// A new route file fails this test until it is added to ROUTES with the permission it needs.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { can, ROLES, type Permission, type Role } from "@/lib/permissions";
import { freshDb } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
interface RouteCase {
  methods: Partial<Record<Method, { permission: Permission; url: string; params?: Record<string, string>; body?: unknown }>>;
}

// Public by design: next-auth's own endpoints (sign-in, CSRF, session) must be reachable signed out.
const PUBLIC = new Set(["app/api/auth/[...nextauth]/route.ts"]);

const ROUTES: Record<string, RouteCase> = {
  "app/api/me/route.ts": { methods: { GET: { permission: "self:read", url: "/api/me" } } },
  "app/api/admin/members/route.ts": { methods: { GET: { permission: "user:manage", url: "/api/admin/members" } } },
  "app/api/audit/route.ts": { methods: { GET: { permission: "audit:read", url: "/api/audit?limit=5" } } },
};

function routeFiles(dir = "app/api"): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? routeFiles(p) : e.name === "route.ts" ? [p.split(path.sep).join("/")] : [];
  });
}

let db: Knex;
const users = new Map<Role, SignedInUser>();

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  for (const u of DEMO_USERS) users.set(u.role, await signInWithPassword(db, u.email, u.password));
});
afterAll(() => db.destroy());

describe("route permission matrix", () => {
  it("covers every route handler file and every exported method", async () => {
    const files = routeFiles().filter((f) => !PUBLIC.has(f));
    expect(files.sort()).toEqual(Object.keys(ROUTES).sort());
    for (const f of files) {
      const mod = (await import(path.resolve(f))) as Record<string, unknown>;
      const exported = ["GET", "POST", "PUT", "PATCH", "DELETE"].filter((m) => typeof mod[m] === "function");
      expect(exported.sort(), f).toEqual(Object.keys(ROUTES[f]!.methods).sort());
    }
  });

  for (const [file, rc] of Object.entries(ROUTES)) {
    for (const [method, spec] of Object.entries(rc.methods)) {
      for (const who of [null, ...ROLES] as Array<Role | null>) {
        const expected = who === null ? 401 : can({ userId: 1, role: who }, spec.permission) ? 200 : 403;
        it(`${method} ${spec.url} as ${who ?? "signed out"} -> ${expected}`, async () => {
          session.current = who ? users.get(who)! : null;
          const mod = (await import(path.resolve(file))) as Record<string, (r: Request, c: unknown) => Promise<Response>>;
          const req = new Request(`http://halflight.test${spec.url}`, {
            method,
            body: spec.body === undefined ? undefined : JSON.stringify(spec.body),
            headers: { "content-type": "application/json" },
          });
          const res = await mod[method]!(req, { params: Promise.resolve(spec.params ?? {}) });
          expect(res.status).toBe(expected);
          const body = (await res.json()) as { error?: { code: string; message: string } };
          if (expected !== 200) {
            expect(body.error?.code).toBe(expected === 401 ? "unauthorized" : "forbidden");
            expect(body.error?.message).toMatch(/\w/);
          } else {
            expect(body.error).toBeUndefined();
          }
        });
      }
    }
  }
});

describe("GET /api/me", () => {
  it("returns the signed-in user, lab and role", async () => {
    session.current = users.get("reviewer")!;
    const { GET } = await import("@/app/api/me/route");
    const res = await GET(new Request("http://halflight.test/api/me"), { params: Promise.resolve({}) });
    const me = await res.json();
    expect(me).toMatchObject({
      user: { email: "rafe.okonkwo@larkspur.example", name: "Rafe Okonkwo" },
      lab: { slug: "larkspur" },
      role: "reviewer",
    });
    expect(me.permissions).toContain("review:decide");
    expect(me.permissions).not.toContain("user:manage");
  });
});

describe("GET /api/audit", () => {
  it("answers 422 with the issues for a bad query", async () => {
    session.current = users.get("admin")!;
    const { GET } = await import("@/app/api/audit/route");
    const res = await GET(new Request("http://halflight.test/api/audit?limit=0"), { params: Promise.resolve({}) });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("unprocessable");
    expect(body.error.issues[0].path).toBe("limit");
  });
});
