"use client";
// The workspace's fits: computed in a Web Worker (falling back to the main thread where workers are unavailable), with
// the last result kept on screen while a newer one is on its way.
import { useEffect, useMemo, useRef, useState } from "react";
import { fitSeriesWithOptions, type SeriesFitOptions, type SeriesFitOutcome } from "@/lib/kinetics/workspace";

export function useSeriesFit(t: number[], y: number[], options: SeriesFitOptions) {
  const tArr = useMemo(() => Float64Array.from(t), [t]);
  const yArr = useMemo(() => Float64Array.from(y), [y]);
  // The first result is computed right away so the page never shows an empty table.
  const [state, setState] = useState<{ outcome: SeriesFitOutcome; ms: number | null; where: "worker" | "page" }>(() => {
    const started = performance.now();
    const outcome = fitSeriesWithOptions(tArr, yArr, options);
    return { outcome, ms: performance.now() - started, where: "page" };
  });
  const [busy, setBusy] = useState(false);
  const worker = useRef<Worker | null>(null);
  const seq = useRef(0);

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    const w = new Worker(new URL("./fit.worker.ts", import.meta.url), { type: "module" });
    w.postMessage({ type: "data", t: tArr, y: yArr });
    w.onmessage = (e: MessageEvent<{ id: number; outcome?: SeriesFitOutcome; ms?: number; error?: string }>) => {
      if (e.data.id !== seq.current) return; // a newer request is on its way
      setBusy(false);
      if (e.data.outcome) setState({ outcome: e.data.outcome, ms: e.data.ms ?? null, where: "worker" });
    };
    worker.current = w;
    return () => {
      w.terminate();
      worker.current = null;
    };
  }, [tArr, yArr]);

  const key = JSON.stringify(options);
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    const id = ++seq.current;
    const parsed = JSON.parse(key) as SeriesFitOptions;
    if (worker.current) {
      setBusy(true);
      worker.current.postMessage({ type: "fit", id, options: parsed });
    } else {
      const started = performance.now();
      setState({ outcome: fitSeriesWithOptions(tArr, yArr, parsed), ms: performance.now() - started, where: "page" });
    }
  }, [key, tArr, yArr]);

  return { ...state, busy };
}
