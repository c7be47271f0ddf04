// Long work through the job queue (pg-boss on PostgreSQL, the in-process path on SQLite): a validation run queued over
// HTTP answers 202 at once, its progress is visible while it runs, the report is stored when it ends; one run per lab
// at a time, decided by the database under concurrent requests; a run past its time limit is stopped with its message
// and nothing is stored.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { enqueueJob, stopQueueWorkers, type JobView } from "@/lib/jobs/background";
import { getValidationRecord } from "@/lib/validation/records";
import { freshDb, onPostgres, signInAs } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));

let db: Knex;
let admin: SignedInUser;
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;

async function queue(): Promise<{ status: number; body: { job?: JobView; error?: { message: string } } }> {
  const { POST } = await import("@/app/api/validation/route");
  const res = await POST(new Request("http://halflight.test/api/validation", { method: "POST" }), ctx());
  return { status: res.status, body: await res.json() };
}

async function status(id: number): Promise<JobView> {
  const { GET } = await import("@/app/api/jobs/[id]/route");
  const res = await GET(new Request(`http://halflight.test/api/jobs/${id}`), ctx({ id: String(id) }));
  expect(res.status).toBe(200);
  return (await res.json()).job;
}

/** Polls the job as the page does, keeping every distinct progress it saw. */
async function watch(id: number, limitMs = 180_000): Promise<{ last: JobView; seen: Array<[number, number]> }> {
  const seen: Array<[number, number]> = [];
  const t0 = Date.now();
  for (;;) {
    const j = await status(id);
    const p: [number, number] = [j.progress.done, j.progress.total];
    if (!seen.length || seen.at(-1)![0] !== p[0] || seen.at(-1)![1] !== p[1]) seen.push(p);
    if (j.state === "done" || j.state === "failed") return { last: j, seen };
    if (Date.now() - t0 > limitMs) throw new Error(`job ${id} still ${j.state} after ${limitMs} ms`);
    await new Promise((r) => setTimeout(r, 40));
  }
}

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  admin = await signInAs(db, "admin");
  session.current = admin;
});
afterAll(async () => {
  await stopQueueWorkers();
  await db.destroy();
});

describe(`a validation run through the job queue (${onPostgres ? "pg-boss on PostgreSQL" : "in-process on SQLite"})`, () => {
  it("answers 202 at once, refuses a second run while the first is under way, shows progress, stores the report", async () => {
    const first = await queue();
    expect(first.status).toBe(202);
    expect(first.body.job).toMatchObject({ kind: "validation-run", state: "queued", progress: { done: 0 } });
    const again = await queue();
    expect(again.status).toBe(409);
    expect(again.body.error?.message).toMatch(/validation run is already under way in this lab \(job \d+\)/);

    const { last, seen } = await watch(first.body.job!.id);
    expect(last.error).toBeNull();
    expect(last.state).toBe("done");
    // Progress was visible part-way (some count between none and all), and ended complete.
    expect(seen.some(([done, total]) => total > 0 && done > 0 && done < total)).toBe(true);
    expect(last.progress.done).toBe(last.progress.total);
    expect(last.progress.total).toBeGreaterThan(30);
    const result = last.result as { id: number; passed: number; failed: number; all_passed: boolean };
    expect(result).toMatchObject({ failed: 0, all_passed: true });
    const rec = await getValidationRecord(db, admin.labId, result.id);
    expect(rec.report.passed).toBe(result.passed);
    expect(rec.run_by).toBe(admin.name);
    const audited = await db("audit_events").where({ action: "validation.run", object_id: String(result.id) }).count({ n: "*" }).first();
    expect(Number(audited?.n)).toBe(1);
    if (onPostgres) {
      // It went through pg-boss: the queue's own table holds the delivered job.
      const rows = (await db.raw(`SELECT state FROM pgboss.job WHERE name = 'halflight-background'`)).rows as Array<{ state: string }>;
      expect(rows.map((r) => r.state)).toContain("completed");
    }
  });

  it("two requests at the same moment start one run; the other is refused with 409", async () => {
    const answers = await Promise.all([queue(), queue(), queue()]);
    expect(answers.map((a) => a.status).sort()).toEqual([202, 409, 409]);
    const started = answers.find((a) => a.status === 202)!.body.job!;
    expect((await watch(started.id)).last.state).toBe("done");
  });

  it("a run past its time limit is stopped and answered with its message; nothing is stored", async () => {
    const before = await db("validation_runs").count({ n: "*" }).first();
    process.env.VALIDATION_TIME_LIMIT_MS = "150";
    let job: JobView;
    try {
      job = await enqueueJob(db, admin, "validation-run");
    } finally {
      // The limit is read when the job starts; on PostgreSQL that is after pg-boss delivers it.
      await new Promise((r) => setTimeout(r, onPostgres ? 2000 : 50));
      delete process.env.VALIDATION_TIME_LIMIT_MS;
    }
    const { last } = await watch(job.id);
    expect(last.state).toBe("failed");
    expect(last.error).toMatch(/ran past its time limit of 0 s and was stopped; nothing was saved/);
    expect(await db("validation_runs").count({ n: "*" }).first()).toEqual(before);
  });
});
