// Long work outside the request: a request queues a job (a row in `jobs`) and answers at once; one server process
// claims it (a conditional UPDATE, so a job runs once however many processes listen), runs the CPU part on the worker
// pool with a time limit, writes its progress to the row as it goes, and stores the result. The page polls the row.
// On PostgreSQL the job is handed out through pg-boss, so any app process behind the same database may take it; on
// SQLite (one machine) the process that queued it runs it.
import type { Knex } from "knex";
import { activeJobOf, claimJob, failJob, finishJob, getJob, getLabJob, insertJob, setJobProgress } from "@/db/queries/jobs";
import { AppError } from "@/lib/errors";
import { isUniqueViolation } from "@/lib/records";
import { runJob } from "./pool";
import { storeValidationReport } from "@/lib/validation/records";
import type { DbJobRow } from "@/db/tables";
import { isSqliteDb } from "@/db/config";

export const BACKGROUND_KINDS = ["validation-run"] as const;
export type BackgroundKind = (typeof BACKGROUND_KINDS)[number];
const QUEUE = "halflight-background";
/** A validation run fits a few hundred reference problems: minutes at most, even on a slow machine. */
export const validationTimeLimitMs = () => Number(process.env.VALIDATION_TIME_LIMIT_MS ?? 300_000);

export interface JobView {
  id: number;
  kind: string;
  state: DbJobRow["state"];
  progress: { done: number; total: number; note: string | null };
  result: unknown;
  error: string | null;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
}

export function jobView(j: DbJobRow): JobView {
  return {
    id: j.id,
    kind: j.kind,
    state: j.state,
    progress: { done: j.progress_done, total: j.progress_total, note: j.progress_note },
    result: j.result ? JSON.parse(j.result) : null,
    error: j.error,
    created_at: j.created_at,
    started_at: j.started_at,
    finished_at: j.finished_at,
  };
}

/** Runs a claimed job to its end: progress as it goes, the result or the failure stored on the row. */
export async function executeJob(db: Knex, id: number): Promise<void> {
  const job = await getJob(db, id);
  if (!job || !(await claimJob(db, id, new Date().toISOString()))) return;
  let last = 0;
  let writing: Promise<void> = Promise.resolve();
  const progress = (done: number, total: number, note: string) => {
    const now = Date.now();
    // At most four progress writes a second, and the last one always.
    if (done < total && now - last < 250) return;
    last = now;
    writing = writing.then(() => setJobProgress(db, id, done, total, note)).catch(() => {});
  };
  try {
    if (job.kind !== "validation-run") throw new Error(`unknown job kind ${job.kind}`);
    const report = await runJob("validation-run", {}, { timeLimitMs: validationTimeLimitMs(), onProgress: progress });
    await writing;
    const stored = await storeValidationReport(db, { labId: job.lab_id, userId: job.created_by! }, report);
    await finishJob(db, id, new Date().toISOString(), stored);
  } catch (e) {
    await writing;
    await failJob(db, id, new Date().toISOString(), e instanceof Error ? e.message : String(e)).catch((f) => console.error(`Job ${id} failed (${(e as Error).message}) and could not be marked: ${(f as Error).message}`));
  }
}

// ---- PostgreSQL: pg-boss hands jobs to any listening process ----

type Boss = import("pg-boss");
const holder = globalThis as unknown as { __halflightBoss?: Map<Knex, Promise<Boss>> };

interface PgConnection {
  query(text: string, values?: unknown[]): Promise<{ rows: unknown[] }>;
}
interface KnexClient {
  acquireConnection(): Promise<PgConnection>;
  releaseConnection(c: PgConnection): Promise<void>;
}

/** pg-boss runs its SQL on the app's own Knex pool (no second set of connections or credentials). */
function bossDb(db: Knex) {
  const client = db.client as KnexClient;
  return {
    async executeSql(text: string, values?: unknown[]) {
      const conn = await client.acquireConnection();
      try {
        return await conn.query(text, values);
      } finally {
        await client.releaseConnection(conn);
      }
    },
  };
}

/** This process's pg-boss on the database, started and listening (once per Knex instance). */
export function startQueueWorker(db: Knex): Promise<Boss> {
  holder.__halflightBoss ??= new Map();
  let started = holder.__halflightBoss.get(db);
  if (!started) {
    started = (async () => {
      const { default: PgBoss } = await import("pg-boss");
      const boss = new PgBoss({ db: bossDb(db), schema: "pgboss", supervise: true, schedule: false });
      boss.on("error", (e) => console.error(`Job queue: ${e.message}`));
      await boss.start();
      await boss.createQueue(QUEUE);
      await boss.work<{ jobId: number }>(QUEUE, { pollingIntervalSeconds: 0.5, batchSize: 1 }, async ([j]) => {
        if (j) await executeJob(db, j.data.jobId);
      });
      return boss;
    })();
    holder.__halflightBoss.set(db, started);
    started.catch(() => holder.__halflightBoss?.delete(db));
  }
  return started;
}

/** Stops this process's queue workers (tests, shutdown). */
export async function stopQueueWorkers(): Promise<void> {
  const all = [...(holder.__halflightBoss?.values() ?? [])];
  holder.__halflightBoss?.clear();
  await Promise.all(all.map(async (p) => (await p.catch(() => null))?.stop({ graceful: true, wait: true, timeout: 10_000 })));
}

/**
 * Queues a job and answers with its row. One queued-or-running job of a kind per lab (the database's partial unique
 * index decides, so two clicks or two processes cannot start two).
 */
export async function enqueueJob(db: Knex, who: { labId: number; userId: number }, kind: BackgroundKind): Promise<JobView> {
  let id: number;
  try {
    id = await insertJob(db, { lab_id: who.labId, kind, created_by: who.userId, created_at: new Date().toISOString() });
  } catch (e) {
    if (!isUniqueViolation(e)) throw e;
    const active = await activeJobOf(db, who.labId, kind);
    throw new AppError({ code: "conflict", message: `A ${kind === "validation-run" ? "validation run" : kind} is already under way in this lab${active ? ` (job ${active.id})` : ""}; wait for it to finish.` });
  }
  if (!isSqliteDb(db)) {
    try {
      const boss = await startQueueWorker(db);
      await boss.send(QUEUE, { jobId: id }, { retryLimit: 0, expireInSeconds: Math.ceil(validationTimeLimitMs() / 1000) + 60 });
    } catch (e) {
      await failJob(db, id, new Date().toISOString(), `The job queue did not take the job: ${(e as Error).message}`);
      throw new AppError({ code: "unavailable", message: "The job queue is not available; nothing was started. Try again in a moment.", retryAfter: 10, cause: e });
    }
  } else {
    setImmediate(() => executeJob(db, id).catch((e) => console.error(`Job ${id}: ${(e as Error).message}`)));
  }
  return jobView((await getLabJob(db, who.labId, id))!);
}

export async function jobStatus(db: Knex, labId: number, id: number): Promise<JobView> {
  const j = await getLabJob(db, labId, id);
  if (!j) throw new AppError({ code: "not_found", message: `There is no job ${id} in this lab.` });
  return jobView(j);
}

/** The lab's queued or running job of a kind, if any. */
export async function activeJob(db: Knex, labId: number, kind: BackgroundKind): Promise<JobView | null> {
  const j = await activeJobOf(db, labId, kind);
  return j ? jobView(j) : null;
}
