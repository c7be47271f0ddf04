"use client";
// The workspace's fits: computed only in a Web Worker (the main thread stays free for the page; it fits itself only
// where workers are unavailable). A newer option cancels the fit under way: that worker is ended and a new one takes
// the series and the newest options. The last result stays on screen, marked as re-fitting, until the new one lands.
import { useEffect, useRef, useState } from "react";
import { provideMathjs } from "@/lib/kinetics/formula";
import { fitSeriesWithOptions, type SeriesFitOptions } from "@/lib/kinetics/workspace";
import { fitDisplay, type FitDisplay, type SlimOutcome } from "./fit-display";

const needsFormula = (o: SeriesFitOptions) => o.models.includes("formula");
/** mathjs is fetched the first time a formula is fitted on the page (where workers are unavailable). */
async function loadFormula(): Promise<void> {
  provideMathjs(await import("mathjs"));
}

type Result = { outcome: SlimOutcome; display: FitDisplay; ms: number | null; where: "worker" | "page" };

/** The page fitting itself (no workers): the same fit and the same decimation as the worker's. */
function fitOnPage(t: Float64Array, y: Float64Array, options: SeriesFitOptions): Result {
  const started = performance.now();
  const r = fitDisplay(fitSeriesWithOptions(t, y, options), t, y, new Set((options.exclusions ?? []).map((e) => e.index)));
  return { ...r, ms: performance.now() - started, where: "page" };
}

export function useSeriesFit(tArr: Float64Array, yArr: Float64Array, options: SeriesFitOptions) {
  const hasWorker = typeof Worker !== "undefined";
  const [state, setState] = useState<Result | null>(() => {
    if (hasWorker || needsFormula(options)) return null;
    return fitOnPage(tArr, yArr, options);
  });
  const [busy, setBusy] = useState(hasWorker);
  const worker = useRef<{ w: Worker; busy: boolean } | null>(null);
  const seq = useRef(0);
  const key = JSON.stringify(options);

  useEffect(() => {
    const parsed = JSON.parse(key) as SeriesFitOptions;
    const id = ++seq.current;
    if (typeof Worker === "undefined") {
      void (needsFormula(parsed) ? loadFormula() : Promise.resolve()).then(() => {
        const r = fitOnPage(tArr, yArr, parsed);
        if (id === seq.current) setState(r);
      });
      return;
    }
    // A worker still fitting older options is ended (cancelled), not waited for.
    if (worker.current?.busy) {
      worker.current.w.terminate();
      worker.current = null;
    }
    if (!worker.current) {
      const w = new Worker(new URL("./fit.worker.ts", import.meta.url), { type: "module" });
      w.postMessage({ type: "data", t: tArr, y: yArr });
      const slot = { w, busy: false };
      w.onmessage = (e: MessageEvent<{ id: number; outcome?: SlimOutcome; display?: FitDisplay; ms?: number; error?: string }>) => {
        slot.busy = false;
        if (e.data.id !== seq.current) return; // a newer request is on its way
        setBusy(false);
        if (e.data.outcome && e.data.display) setState({ outcome: e.data.outcome, display: e.data.display, ms: e.data.ms ?? null, where: "worker" });
      };
      worker.current = slot;
    }
    worker.current.busy = true;
    queueMicrotask(() => setBusy(true));
    worker.current.w.postMessage({ type: "fit", id, options: parsed });
  }, [key, tArr, yArr]);

  // A new series (or leaving the page) ends the worker.
  useEffect(
    () => () => {
      worker.current?.w.terminate();
      worker.current = null;
    },
    [tArr, yArr],
  );

  return { result: state, busy };
}
