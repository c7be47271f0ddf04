// A worker thread of the job pool: runs one job at a time and answers with its output or its error.
import { parentPort } from "node:worker_threads";
import { transferables, WORK, type JobKind } from "./work";

parentPort!.on("message", async (m: { id: number; kind: JobKind; input: never }) => {
  try {
    const output = await WORK[m.kind](m.input, (done, total, note) => parentPort!.postMessage({ id: m.id, progress: { done, total, note } }));
    parentPort!.postMessage({ id: m.id, ok: true, output }, transferables(output));
  } catch (e) {
    const err = e as Error & { code?: string; line?: number; reason?: string };
    parentPort!.postMessage({ id: m.id, ok: false, error: { name: err.name, message: err.message, reason: err.reason, code: err.code, line: err.line } });
  }
});
