// Re-fits off the main thread, so the page never freezes: the series arrives once, then each message carries options.
import { provideMathjs } from "@/lib/kinetics/formula";
import { fitSeriesWithOptions, type SeriesFitOptions } from "@/lib/kinetics/workspace";
import { fitDisplay } from "./fit-display";

let formulaLoaded = false;

type Message = { type: "data"; t: Float64Array; y: Float64Array } | { type: "fit"; id: number; options: SeriesFitOptions };

let t: Float64Array = new Float64Array(0);
let y: Float64Array = new Float64Array(0);

self.onmessage = async (e: MessageEvent<Message>) => {
  const m = e.data;
  if (m.type === "data") {
    t = m.t;
    y = m.y;
    return;
  }
  const started = performance.now();
  try {
    // mathjs is fetched the first time a formula is fitted, not with the page.
    if (!formulaLoaded && m.options.models.includes("formula")) {
      provideMathjs(await import("mathjs"));
      formulaLoaded = true;
    }
    // The fit uses every point; what the page draws is decimated here, off its main thread.
    const full = fitSeriesWithOptions(t, y, m.options);
    const { outcome, display } = fitDisplay(full, t, y, new Set((m.options.exclusions ?? []).map((e) => e.index)));
    postMessage({ id: m.id, outcome, display, ms: performance.now() - started });
  } catch (err) {
    postMessage({ id: m.id, error: err instanceof Error ? err.message : String(err) });
  }
};
