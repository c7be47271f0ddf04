// CPU work off the request thread: fits and parses run on the pool's worker threads (the bundle npm run build writes),
// each with a time limit; a job past it is stopped and answered plainly, and the pool goes on working.
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { runJob } from "@/lib/jobs/pool";
import { seededRandom } from "../helpers/random";

function trace(n: number) {
  const rnd = seededRandom(7);
  const t = new Float64Array(n),
    y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = i;
    y[i] = 0.05 + 0.9 * Math.exp(-i / (n / 4)) + 0.003 * rnd.normal();
  }
  return { t, y };
}

describe("the job pool", () => {
  it("a big fit runs on a worker thread: the request thread's timers keep firing meanwhile", async () => {
    const { t, y } = trace(400_000);
    let ticks = 0;
    const timer = setInterval(() => ticks++, 5);
    const out = await runJob("fit-series", { t, y, options: { models: ["first-order", "linearized", "second-order"] } });
    clearInterval(timer);
    expect(out.models.find((m) => m.model === "first-order")!.result.converged).toBe(true);
    // Had the fit run on this thread, no timer could have fired before it returned.
    expect(ticks).toBeGreaterThan(3);
  });

  it("a job past its time limit is stopped with a plain message, and the next job still runs", async () => {
    const { t, y } = trace(1_000_000);
    const e = await runJob("fit-series", { t, y, options: { models: ["first-order", "biexponential", "second-order"] } }, { timeLimitMs: 30 }).then(
      () => null,
      (x: unknown) => x,
    );
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).status).toBe(422);
    expect((e as AppError).message).toMatch(/ran past its time limit of 0 s and was stopped; nothing was saved/);
    const small = trace(200);
    const ok = await runJob("fit-series", { t: small.t, y: small.y, options: { models: ["first-order"] } });
    expect(ok.models[0]!.result.converged).toBe(true);
  });

  it("a parse refused on a worker comes back as the parser's own error, with its line", async () => {
    const r = await runJob("parse-export", { bytes: new TextEncoder().encode("Time (s),A\n0,1\n1,0.5x\n"), fileName: "bad.csv" });
    expect(r.parsed).toBeNull();
    expect(r.error).toEqual({ message: 'line 3: "A" holds "0.5x", which is not a number', reason: '"A" holds "0.5x", which is not a number', line: 3 });
    expect(r.ranking[0]!.name).toBe("delimited");
  });
});
