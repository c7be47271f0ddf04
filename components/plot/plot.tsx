"use client";
// The one plotting component: react-plotly.js over plotly.js-dist-min (through the factory), loaded in the browser only
// (from an effect: never on the server).
import { useEffect, useMemo, useRef, useState, type ComponentType } from "react";
import { flushSync } from "react-dom";
import type { PlotParams } from "react-plotly.js";

type PlotComponent = ComponentType<PlotParams>;
let plotComponent: PlotComponent | null = null;
let loading: Promise<PlotComponent> | null = null;
/** plotly (about 3.5 MB of script) is fetched on the first plot that comes near the viewport, once per page. */
function loadPlotComponent(): Promise<PlotComponent> {
  loading ??= Promise.all([import("react-plotly.js/factory"), import("plotly.js-dist-min")]).then(([{ default: createPlotlyComponent }, plotly]) => {
    plotComponent = createPlotlyComponent((plotly as { default?: object }).default ?? plotly) as PlotComponent;
    return plotComponent;
  });
  return loading;
}

/**
 * True once the element has come within a screen of the viewport (and from then on): plots below the fold are not
 * drawn until the reader scrolls towards them. Where IntersectionObserver is missing, at once.
 */
function useNearViewport<T extends Element>(): [React.RefObject<T | null>, boolean] {
  const ref = useRef<T>(null);
  const [near, setNear] = useState(() => typeof IntersectionObserver === "undefined");
  useEffect(() => {
    if (near || !ref.current) return;
    const io = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) {
        setNear(true);
        io.disconnect();
      }
    }, { rootMargin: "100% 0px" });
    io.observe(ref.current);
    return () => io.disconnect();
  }, [near]);
  return [ref, near];
}

/**
 * Runs a state update in a main-thread task of its own (a zero-delay timeout, rendered at once with flushSync), so
 * that when several plots change together each plotly draw is a separate task instead of one long one, and input is
 * handled between them. Answers the cancel.
 */
function inOwnTask(update: () => void): () => void {
  const id = setTimeout(() => flushSync(update), 0);
  return () => clearTimeout(id);
}

/** The figure to draw, taken up in its own task; the flag is true while a newer figure waits (aria-busy meanwhile). */
function useFigureInOwnTask<T>(figure: T): [T, boolean] {
  const [drawn, setDrawn] = useState(figure);
  useEffect(() => (drawn === figure ? undefined : inOwnTask(() => setDrawn(figure))), [figure, drawn]);
  return [drawn, drawn !== figure];
}

const CONFIG: PlotParams["config"] = { displaylogo: false, responsive: true, modeBarButtonsToRemove: ["lasso2d"] };
const FONT = { family: "var(--hl-font-sans), system-ui, sans-serif", size: 12, color: "#3a4457" };

export function Plot({
  data,
  layout,
  height = 320,
  label,
  onClick,
  onSelected,
}: {
  data: PlotParams["data"];
  layout?: PlotParams["layout"];
  height?: number;
  label: string;
  onClick?: PlotParams["onClick"];
  onSelected?: PlotParams["onSelected"];
}) {
  const [ref, near] = useNearViewport<HTMLElement>();
  // Each plot mounts in a task of its own once plotly has loaded (not every plot of the page in one long task).
  const [Plotly, setPlotly] = useState<PlotComponent | null>(() => plotComponent);
  const [failed, setFailed] = useState(false);
  useEffect(() => {
    if (!near || Plotly) return;
    let live = true;
    let cancel = () => {};
    loadPlotComponent().then(
      (C) => {
        if (live) cancel = inOwnTask(() => setPlotly(() => C));
      },
      () => {
        loading = null; // a later plot (or a reload) tries again
        if (live) setFailed(true);
      },
    );
    return () => {
      live = false;
      cancel();
    };
  }, [near, Plotly]);
  // Same identity while the caller's layout is the same (react-plotly.js redraws on any new layout or data object).
  const fullLayout = useMemo(
    () => ({
      autosize: true,
      height,
      margin: { l: 56, r: 16, t: 30, b: 44 },
      paper_bgcolor: "rgba(0,0,0,0)",
      plot_bgcolor: "#ffffff",
      font: FONT,
      legend: { orientation: "h" as const, x: 0, y: 1.0, yanchor: "bottom" as const },
      xaxis: { gridcolor: "#eceae3", zeroline: false, ...layout?.xaxis },
      yaxis: { gridcolor: "#eceae3", zeroline: false, ...layout?.yaxis },
      ...layout,
    }),
    [layout, height],
  );
  const [figure, pending] = useFigureInOwnTask(useMemo(() => ({ data, layout: fullLayout }), [data, fullLayout]));
  return (
    <figure ref={ref} aria-label={label} aria-busy={pending} className="w-full" style={{ height }}>
      {!near ? (
        <div className="h-full w-full rounded-cell bg-paper-sunk" aria-hidden="true" />
      ) : failed && !Plotly ? (
        <div className="flex h-full w-full items-center justify-center rounded-cell bg-paper-sunk text-sm text-ink-700" role="alert">
          The plotting code could not be loaded (the connection dropped?); reload the page to draw this plot.
        </div>
      ) : !Plotly ? (
        <div className="h-full w-full animate-pulse rounded-cell bg-paper-sunk" aria-label="Loading plot" />
      ) : (
        <Plotly
          data={figure.data}
          layout={figure.layout}
          config={CONFIG}
          onClick={onClick}
          onSelected={onSelected}
          useResizeHandler
          style={{ width: "100%", height: "100%" }}
        />
      )}
    </figure>
  );
}
