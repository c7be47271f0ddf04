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
import { ingestExport } from "@/lib/ingest";
import { saveFit } from "@/lib/fits";
import { createStudy } from "@/lib/studies";
import { runValidation } from "@/lib/validation";
import { storeValidationReport } from "@/lib/validation/records";
import { can, ROLES, type Permission, type Role } from "@/lib/permissions";
import { freshDb } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
interface RouteCase {
  methods: Partial<Record<Method, { permission: Permission; url: string; params?: Record<string, string>; form?: () => FormData; json?: unknown | ((role: Role | null) => unknown); ok?: number[] }>>;
}

const passwordOf = (r: Role | null) => DEMO_USERS.find((u) => u.role === r)?.password ?? "";
const CV_FILE = "fixtures/published/crystal-violet-590nm.csv";
const cvForm = () => {
  const f = new FormData();
  f.set("file", new File([fs.readFileSync(CV_FILE)], "crystal-violet-590nm.csv"));
  return f;
};

// Public by design: next-auth's own endpoints (sign-in, CSRF, session) must be reachable signed out.
// The invitation link and the instrument upload carry their own credential (a one-time token, an API key): both are
// tested in admin.test.ts.
// Public by design: sign-in, the invitee's one-time link, instrument keys, and the load balancer's health check.
const PUBLIC = new Set(["app/api/auth/[...nextauth]/route.ts", "app/api/invitations/[token]/route.ts", "app/api/ingest/route.ts", "app/api/health/route.ts"]);
const METHOD_JSON = { definition: { name: "Matrix method", analyte: "corvane blue", wavelength_nm: 590, criteria: [{ kind: "r2_min", value: 0.99 }] } };
const CAL_JSON = { name: "Matrix calibration", analyte: "corvane blue", standards: [0, 1, 2, 3, 4].map((c) => ({ concentration: c, absorbance: 0.1 * c + 0.001 * (c % 2) })) };

const ROUTES: Record<string, RouteCase> = {
  "app/api/me/route.ts": { methods: { GET: { permission: "self:read", url: "/api/me" } } },
  "app/api/admin/members/route.ts": { methods: { GET: { permission: "user:manage", url: "/api/admin/members" } } },
  // The admin unlocks the lockout-free analyst (user 3): a harmless, audited change.
  "app/api/admin/members/[userId]/route.ts": {
    methods: { POST: { permission: "user:manage", url: "/api/admin/members/3", params: { userId: "3" }, json: { action: "unlock", reason: "matrix test" } } },
  },
  "app/api/admin/invitations/route.ts": {
    methods: { GET: { permission: "user:manage", url: "/api/admin/invitations" }, POST: { permission: "user:manage", url: "/api/admin/invitations", json: { email: "matrix.invitee@larkspur.example", name: "Matrix Invitee", role: "analyst" }, ok: [201] } },
  },
  "app/api/admin/invitations/[id]/route.ts": { methods: { DELETE: { permission: "user:manage", url: "/api/admin/invitations/1", params: { id: "1" } } } },
  "app/api/admin/settings/route.ts": {
    methods: { GET: { permission: "user:manage", url: "/api/admin/settings" }, PUT: { permission: "user:manage", url: "/api/admin/settings", json: { outside_links: false, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "matrix test" } } },
  },
  "app/api/admin/api-keys/route.ts": {
    methods: { GET: { permission: "user:manage", url: "/api/admin/api-keys" }, POST: { permission: "user:manage", url: "/api/admin/api-keys", json: { name: "Matrix bench" }, ok: [201] } },
  },
  "app/api/admin/api-keys/[id]/route.ts": { methods: { DELETE: { permission: "user:manage", url: "/api/admin/api-keys/1", params: { id: "1" } } } },
  "app/api/methods/route.ts": {
    methods: { GET: { permission: "method:read", url: "/api/methods?sort=name&dir=asc" }, POST: { permission: "method:write", url: "/api/methods", json: METHOD_JSON, ok: [201] } },
  },
  "app/api/methods/[id]/route.ts": {
    methods: {
      GET: { permission: "method:read", url: "/api/methods/1", params: { id: "1" } },
      POST: { permission: "method:write", url: "/api/methods/1", params: { id: "1" }, json: { definition: { ...METHOD_JSON.definition, name: "Matrix method, changed" }, reason: "matrix test" }, ok: [201, 409] },
    },
  },
  "app/api/calibrations/route.ts": {
    methods: { GET: { permission: "method:read", url: "/api/calibrations" }, POST: { permission: "calibration:write", url: "/api/calibrations", json: CAL_JSON, ok: [201] } },
  },
  "app/api/calibrations/[id]/route.ts": { methods: { GET: { permission: "method:read", url: "/api/calibrations/1", params: { id: "1" } } } },
  "app/api/runs/[id]/method/route.ts": { methods: { POST: { permission: "run:upload", url: "/api/runs/1/method", params: { id: "1" }, json: { methodId: 1, reason: "matrix test" } } } },
  "app/api/audit/route.ts": { methods: { GET: { permission: "audit:read", url: "/api/audit?limit=5" } } },
  "app/api/uploads/route.ts": { methods: { POST: { permission: "run:upload", url: "/api/uploads", form: cvForm } } },
  "app/api/runs/route.ts": {
    methods: {
      GET: { permission: "run:read", url: "/api/runs?pageSize=5" },
      // The first permitted role stores the file (201); the next is answered with the existing run (200).
      POST: { permission: "run:upload", url: "/api/runs", form: cvForm, ok: [200, 201] },
    },
  },
  "app/api/runs/[id]/route.ts": { methods: { GET: { permission: "run:read", url: "/api/runs/1", params: { id: "1" } } } },
  "app/api/runs/[id]/series/[sid]/points/route.ts": { methods: { GET: { permission: "run:read", url: "/api/runs/1/series/1/points", params: { id: "1", sid: "1" } } } },
  "app/api/runs/[id]/series/[sid]/route.ts": {
    methods: { GET: { permission: "run:read", url: "/api/runs/1/series/1?maxPoints=50", params: { id: "1", sid: "1" } } },
  },
  "app/api/raw-files/[id]/route.ts": { methods: { GET: { permission: "run:read", url: "/api/raw-files/1", params: { id: "1" } } } },
  "app/api/fits/route.ts": {
    methods: {
      GET: { permission: "fit:read", url: "/api/fits" },
      POST: { permission: "fit:write", url: "/api/fits", json: { runId: 1, seriesId: 1, title: "Matrix", options: { models: ["first-order"] } }, ok: [200, 201] },
    },
  },
  "app/api/fits/[id]/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1", params: { id: "1" } } } },
  "app/api/fits/[id]/versions/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1/versions", params: { id: "1" } } } },
  "app/api/fits/[id]/export/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1/export?kind=parameters", params: { id: "1" } } } },
  "app/api/studies/route.ts": {
    methods: {
      GET: { permission: "study:read", url: "/api/studies" },
      POST: { permission: "study:write", url: "/api/studies", json: { name: "Matrix", members: [{ fitId: 1, temperature_c: 25, temperature_reason: "matrix test" }, { fitId: 2, temperature_c: 35, temperature_reason: "matrix test" }] }, ok: [201] },
    },
  },
  "app/api/studies/[id]/route.ts": {
    methods: {
      GET: { permission: "study:read", url: "/api/studies/1", params: { id: "1" } },
      // The first permitted role saves version 2; the next changes version 1, no longer the newest (409).
      POST: { permission: "study:write", url: "/api/studies/1", params: { id: "1" }, json: { reason: "matrix test", options: { weighted: false } }, ok: [201, 409] },
    },
  },
  // Signed acts carry the signer's own password. Run in this order: submit, decide, withdraw (then a conflict).
  "app/api/fits/[id]/review/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1/review", params: { id: "1" } } } },
  "app/api/fits/[id]/submit/route.ts": {
    methods: { POST: { permission: "fit:submit", url: "/api/fits/1/submit", params: { id: "1" }, json: (r: Role | null) => ({ password: passwordOf(r) }), ok: [200, 409] } },
  },
  "app/api/fits/[id]/decision/route.ts": {
    methods: { POST: { permission: "review:decide", url: "/api/fits/1/decision", params: { id: "1" }, json: (r: Role | null) => ({ decision: "approved", password: passwordOf(r) }) } },
  },
  "app/api/fits/[id]/withdraw/route.ts": {
    // Only the author may withdraw: another permitted role meets the record's own rule (403), never the role check.
    methods: { POST: { permission: "fit:submit", url: "/api/fits/1/withdraw", params: { id: "1" }, json: { reason: "matrix test" }, ok: [403, 409] } },
  },
  "app/api/fits/[id]/comments/route.ts": {
    methods: {
      GET: { permission: "fit:read", url: "/api/fits/1/comments", params: { id: "1" } },
      POST: { permission: "fit:read", url: "/api/fits/1/comments", params: { id: "1" }, json: { body: "matrix comment" }, ok: [201] },
    },
  },
  "app/api/fits/[id]/report/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1/report", params: { id: "1" } } } },
  "app/api/fits/[id]/share/route.ts": {
    methods: {
      GET: { permission: "share:create", url: "/api/fits/1/share", params: { id: "1" } },
      POST: { permission: "share:create", url: "/api/fits/1/share", params: { id: "1" }, json: {}, ok: [201] },
    },
  },
  "app/api/share-links/[id]/revoke/route.ts": { methods: { POST: { permission: "share:revoke", url: "/api/share-links/1/revoke", params: { id: "1" } } } },
  // Any signed-in member may open a link; this token matches no link, so the answer is the link's own 404.
  "app/api/share/[token]/route.ts": { methods: { GET: { permission: "self:read", url: "/api/share/x", params: { token: "AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA" }, ok: [404] } } },
  "app/api/fits/[id]/audit/route.ts": { methods: { GET: { permission: "fit:read", url: "/api/fits/1/audit", params: { id: "1" } } } },
  "app/api/validation/route.ts": {
    methods: { GET: { permission: "validation:run", url: "/api/validation" }, POST: { permission: "validation:run", url: "/api/validation", ok: [202] } },
  },
  "app/api/jobs/[id]/route.ts": { methods: { GET: { permission: "validation:run", url: "/api/jobs/1", params: { id: "1" } } },
  },
  "app/api/validation/[id]/route.ts": { methods: { GET: { permission: "validation:run", url: "/api/validation/1", params: { id: "1" } } } },
  "app/api/validation/[id]/sign/route.ts": {
    methods: { POST: { permission: "validation:run", url: "/api/validation/1/sign", params: { id: "1" }, json: (r: Role | null) => ({ password: passwordOf(r) }) } },
  },
  "app/api/validation/[id]/report/route.ts": { methods: { GET: { permission: "validation:run", url: "/api/validation/1/report", params: { id: "1" } } } },
  "app/api/reviews/route.ts": { methods: { GET: { permission: "review:read", url: "/api/reviews" } } },
  "app/api/audit/verify/route.ts": { methods: { GET: { permission: "audit:read", url: "/api/audit/verify" } } },
  "app/api/admin/integrity/route.ts": { methods: { POST: { permission: "audit:read", url: "/api/admin/integrity", json: {} } } },
  "app/api/studies/[id]/results/route.ts": { methods: { GET: { permission: "study:read", url: "/api/studies/1/results", params: { id: "1" } } } },
  "app/api/studies/[id]/export/route.ts": { methods: { GET: { permission: "study:read", url: "/api/studies/1/export", params: { id: "1" } } } },
  "app/api/studies/[id]/review/route.ts": { methods: { GET: { permission: "study:read", url: "/api/studies/1/review", params: { id: "1" } } } },
  "app/api/studies/[id]/submit/route.ts": {
    methods: { POST: { permission: "study:write", url: "/api/studies/1/submit", params: { id: "1" }, json: (r: Role | null) => ({ password: passwordOf(r) }), ok: [200, 409] } },
  },
  // Study 1 is superseded by the matrix's own change above, so its submission and decision meet the record's rule (409);
  // the study review flow itself is tested in reviews.test.ts.
  "app/api/studies/[id]/decision/route.ts": {
    methods: { POST: { permission: "review:decide", url: "/api/studies/1/decision", params: { id: "1" }, json: (r: Role | null) => ({ decision: "approved", password: passwordOf(r) }), ok: [200, 409] } },
  },
  "app/api/studies/[id]/withdraw/route.ts": {
    methods: { POST: { permission: "study:write", url: "/api/studies/1/withdraw", params: { id: "1" }, json: { reason: "matrix test" }, ok: [403, 409] } },
  },
  "app/api/studies/[id]/comments/route.ts": {
    methods: {
      GET: { permission: "study:read", url: "/api/studies/1/comments", params: { id: "1" } },
      POST: { permission: "study:read", url: "/api/studies/1/comments", params: { id: "1" }, json: { body: "matrix comment" }, ok: [201] },
    },
  },
  "app/api/studies/[id]/share/route.ts": {
    methods: { GET: { permission: "share:create", url: "/api/studies/1/share", params: { id: "1" } }, POST: { permission: "share:create", url: "/api/studies/1/share", params: { id: "1" }, json: {}, ok: [201] } },
  },
  "app/api/studies/[id]/report/route.ts": { methods: { GET: { permission: "study:read", url: "/api/studies/1/report", params: { id: "1" } } } },
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
  // A stored run for the read routes (a different file from the one the POST cases upload).
  const analyst = users.get("analyst")!;
  await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync("parsers/delimited/fixtures/cv-tab-mmss.txt")), fileName: "cv-tab-mmss.txt" });
  await saveFit(db, analyst, { runId: 1, seriesId: 1, title: "First", options: { models: ["linearized", "first-order"] } });
  await saveFit(db, analyst, { runId: 1, seriesId: 1, title: "Second", options: { models: ["first-order"], fixed: { ainf: 0.04 } } });
  // A stored validation report for its read and sign routes (the POST case only queues a run).
  await storeValidationReport(db, users.get("admin")!, runValidation());
  await createStudy(db, analyst, { name: "Seed study", kind: "temperature", members: [{ fitId: 1, temperature_c: 25, temperature_reason: "seed" }, { fitId: 2, temperature_c: 35, temperature_reason: "seed" }], options: { weighted: true } });
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
        const allowed = who !== null && can({ userId: 1, role: who }, spec.permission);
        const expected = who === null ? 401 : allowed ? 200 : 403;
        it(`${method} ${spec.url} as ${who ?? "signed out"} -> ${allowed ? (spec.ok ?? [200]).join("/") : expected}`, async () => {
          session.current = who ? users.get(who)! : null;
          const mod = (await import(path.resolve(file))) as Record<string, (r: Request, c: unknown) => Promise<Response>>;
          const json = typeof spec.json === "function" ? (spec.json as (r: Role | null) => unknown)(who) : spec.json;
          const body = spec.form ? spec.form() : json !== undefined ? JSON.stringify(json) : undefined;
          const req = new Request(`http://halflight.test${spec.url}`, { method, body });
          const res = await mod[method]!(req, { params: Promise.resolve(spec.params ?? {}) });
          if (allowed) expect(spec.ok ?? [200]).toContain(res.status);
          else expect(res.status).toBe(expected);
          if (!res.headers.get("content-type")?.includes("json")) return;
          const answer = (await res.json()) as { error?: { code: string; message: string } };
          if (!allowed) {
            expect(answer.error?.code).toBe(expected === 401 ? "unauthorized" : "forbidden");
            expect(answer.error?.message).toMatch(/\w/);
          } else if (res.status < 300) {
            expect(answer.error).toBeUndefined();
          } else {
            // An allowed status above 299 is the record's own answer (a conflict, authorship), never the role check.
            expect(answer.error?.message).not.toBe("Your role in this lab does not allow this.");
            expect(answer.error?.code).not.toBe("unauthorized");
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
