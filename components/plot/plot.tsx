"use client";
// The one plotting component: react-plotly.js over plotly.js-dist-min (through the factory), loaded in the browser only.
import dynamic from "next/dynamic";
import { useEffect, useMemo, useRef, useState } from "react";
import type { PlotParams } from "react-plotly.js";

const Plotly = dynamic(
  async () => {
    const [{ default: createPlotlyComponent }, plotly] = await Promise.all([import("react-plotly.js/factory"), import("plotly.js-dist-min")]);
    return createPlotlyComponent(plotly.default ?? plotly);
  },
  { ssr: false, loading: () => <div className="h-full w-full animate-pulse rounded-cell bg-paper-sunk" aria-label="Loading plot" /> },
);

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
  return (
    <figure ref={ref} aria-label={label} className="w-full" style={{ height }}>
      {!near ? (
        <div className="h-full w-full rounded-cell bg-paper-sunk" aria-hidden="true" />
      ) : (
        <Plotly
          data={data}
          layout={fullLayout}
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
