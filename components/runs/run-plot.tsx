"use client";
// A run's channels on one plot, each read through SWR from the series endpoint (decimated by the server for display).
import useSWR from "swr";
import { Plot } from "@/components/plot/plot";
import { CHANNEL_PALETTE, solutionColour } from "@/lib/colour/wavelength";
import { fetcher } from "@/lib/http/fetcher";

interface SeriesPoints {
  id: number;
  name: string;
  unit: string;
  points: number;
  decimated: { method: string; shown: number } | null;
  t: number[];
  y: number[];
}

export function RunChannelsPlot({ runId, series, wavelength }: { runId: number; series: Array<{ id: number; name: string; unit: string; quantity: string }>; wavelength: number | null }) {
  const { data, error } = useSWR<SeriesPoints[]>(`run-${runId}-channels`, () => Promise.all(series.map((s) => fetcher<SeriesPoints>(`/api/runs/${runId}/series/${s.id}?maxPoints=2000`))));
  if (error) return <p role="alert" className="text-fault-700">The channels could not be loaded: {error.message}</p>;
  if (!data) return <div className="h-80 animate-pulse rounded-cell bg-paper-sunk" aria-label="Loading channels" />;
  const base = solutionColour(wavelength).hex;
  const long = data.some((s) => s.t.length > 1000);
  const minutes = data.some((s) => (s.t.at(-1) ?? 0) > 600);
  const decimated = data.filter((s) => s.decimated);
  return (
    <>
      <Plot
        label={`Channels of run ${runId}`}
        data={data.map((s, i) => ({
          type: long ? "scattergl" : "scatter",
          mode: s.t.length > 200 ? "lines" : "lines+markers",
          name: s.name,
          x: minutes ? s.t.map((t) => t / 60) : s.t,
          y: s.y,
          marker: { size: 5, color: data.length === 1 ? base : CHANNEL_PALETTE[i % CHANNEL_PALETTE.length] },
          line: { width: 1.5, color: data.length === 1 ? base : CHANNEL_PALETTE[i % CHANNEL_PALETTE.length] },
        }))}
        layout={{ xaxis: { title: { text: minutes ? "t (min)" : "t (s)" } }, yaxis: { title: { text: series[0]?.quantity === "concentration" ? `c (${series[0].unit})` : "A (AU)" } } }}
      />
      {decimated.length > 0 && (
        <p className="mt-1 text-xs text-ink-500">
          For display only: {decimated.map((s) => `${s.name} shows ${s.decimated!.shown.toLocaleString("en")} of ${s.points.toLocaleString("en")} points`).join("; ")} (the lowest and highest reading per column of the plot). Fits use every point.
        </p>
      )}
    </>
  );
}
