// CPU-heavy work off the request thread: a small pool of worker threads (node:worker_threads) running the bundle
// `npm run build` writes (dist/jobs-worker.mjs). Each job has a time limit; a job past it is stopped by ending its
// worker (a new one takes its place) and answered with a plain message. The queue is bounded: past it the server
// says it is busy. Without the bundle (a development checkout before its first build) jobs run in the calling thread,
// said once in the log; a production server refuses to run without it.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { AppError } from "@/lib/errors";
import { FitSpecError, GlobalFitError } from "@/lib/kinetics";
import { ParseError } from "@/parsers";
import { WORK, type JobKind, type JobTypes, type Progress } from "./work";

export const JOB_TIME_LIMIT_MS = Number(process.env.JOB_TIME_LIMIT_MS ?? 30_000);
const QUEUE_LIMIT = 200;

interface Pending {
  id: number;
  kind: JobKind;
  input: unknown;
  timeLimitMs: number;
  onProgress?: Progress;
  resolve: (v: unknown) => void;
  reject: (e: unknown) => void;
}

interface Slot {
  worker: Worker;
  job: Pending | null;
  timer: NodeJS.Timeout | null;
}

function revive(e: { name: string; message: string; reason?: string; code?: string; line?: number }): Error {
  if (e.name === "FitSpecError") return new FitSpecError(e.message);
  if (e.name === "GlobalFitError") return new GlobalFitError(e.message);
  if (e.name === "ParseError") return new ParseError(e.reason ?? e.message, e.line);
  if (e.name === "AppError" && e.code) return new AppError({ code: e.code as never, message: e.message, line: e.line });
  return new Error(e.message);
}

export function workerBundle(): string {
  return process.env.HALFLIGHT_JOBS_WORKER ?? path.join(process.cwd(), "dist", "jobs-worker.mjs");
}

class JobPool {
  private slots: Slot[] = [];
  private queue: Pending[] = [];
  private next = 1;

  constructor(
    private readonly file: string,
    private readonly size: number,
  ) {
    for (let i = 0; i < size; i++) this.slots.push(this.spawn());
  }

  private spawn(): Slot {
    const slot: Slot = { worker: new Worker(this.file), job: null, timer: null };
    slot.worker.unref();
    slot.worker.on("message", (m: { id: number; ok?: boolean; progress?: { done: number; total: number; note: string }; output?: unknown; error?: { name: string; message: string; reason?: string; code?: string; line?: number } }) => {
      const job = slot.job;
      if (!job || job.id !== m.id) return;
      if (m.progress) {
        job.onProgress?.(m.progress.done, m.progress.total, m.progress.note);
        return;
      }
      this.finish(slot);
      if (m.ok) job.resolve(m.output);
      else job.reject(revive(m.error!));
    });
    slot.worker.on("error", (e) => this.fail(slot, e));
    slot.worker.on("exit", (code) => {
      if (slot.job) this.fail(slot, new Error(`the worker stopped (exit ${code})`));
    });
    return slot;
  }

  private finish(slot: Slot): void {
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = null;
    slot.job = null;
    this.dispatch();
  }

  private replace(slot: Slot): void {
    const i = this.slots.indexOf(slot);
    void slot.worker.terminate();
    if (i >= 0) this.slots[i] = this.spawn();
  }

  private fail(slot: Slot, e: unknown): void {
    const job = slot.job;
    slot.job = null;
    if (slot.timer) clearTimeout(slot.timer);
    this.replace(slot);
    job?.reject(e);
    this.dispatch();
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (slot.job || this.queue.length === 0) continue;
      const job = this.queue.shift()!;
      slot.job = job;
      slot.timer = setTimeout(() => {
        if (slot.job !== job) return;
        slot.job = null;
        this.replace(slot);
        job.reject(new AppError({ code: "unprocessable", message: `This computation ran past its time limit of ${Math.round(job.timeLimitMs / 1000)} s and was stopped; nothing was saved. Narrow it (a window, fewer models, a simpler formula) and try again.` }));
        this.dispatch();
      }, job.timeLimitMs);
      slot.worker.ref();
      slot.worker.postMessage({ id: job.id, kind: job.kind, input: job.input });
    }
    for (const slot of this.slots) if (!slot.job) slot.worker.unref();
  }

  run<K extends JobKind>(kind: K, input: JobTypes[K]["input"], timeLimitMs: number, onProgress?: Progress): Promise<JobTypes[K]["output"]> {
    if (this.queue.length >= QUEUE_LIMIT) return Promise.reject(new AppError({ code: "unavailable", message: "The server is busy with other computations; try again in a moment.", retryAfter: 5 }));
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.next++, kind, input, timeLimitMs, onProgress, resolve: resolve as (v: unknown) => void, reject });
      this.dispatch();
    });
  }
}

const holder = globalThis as unknown as { __halflightJobs?: JobPool | "inline" };

function pool(): JobPool | "inline" {
  if (holder.__halflightJobs) return holder.__halflightJobs;
  const file = workerBundle();
  if (!fs.existsSync(file)) {
    if (process.env.NODE_ENV === "production") throw new Error(`The job worker ${file} is missing: run npm run build before npm start.`);
    console.warn(`Halflight: ${file} is not built yet (npm run build:server), so computations run in the request thread.`);
    holder.__halflightJobs = "inline";
    return "inline";
  }
  const size = Number(process.env.JOB_WORKERS ?? Math.max(1, Math.min(4, os.availableParallelism() - 1)));
  holder.__halflightJobs = new JobPool(file, size);
  return holder.__halflightJobs;
}

/** Runs a job on a worker thread with a time limit (the default JOB_TIME_LIMIT_MS), reporting progress if it does. */
export async function runJob<K extends JobKind>(kind: K, input: JobTypes[K]["input"], opts: { timeLimitMs?: number; onProgress?: Progress } = {}): Promise<JobTypes[K]["output"]> {
  const p = pool();
  if (p === "inline") return WORK[kind](input, opts.onProgress ?? (() => {}));
  return p.run(kind, input, opts.timeLimitMs ?? JOB_TIME_LIMIT_MS, opts.onProgress);
}
