"use client";
// A temperature study's Arrhenius and Eyring plots: ln k (or ln k/T) ± SE against 1000/T, the line and its 95 % band.
import type { Data } from "plotly.js";
import { Plot } from "@/components/plot/plot";
import { bandTraces, errorMarkerTrace, lineTrace } from "@/components/plot/traces";
import type { StudyRecord } from "@/lib/studies";
import { eyringBandOf } from "./study-state";

type TemperatureResults = Extract<StudyRecord["results"], { kind: "temperature" }>;
const x = (T: number) => 1000 / T;
const BAND = "rgba(26,138,148,0.18)";

export function RatePlots({ r, members }: { r: TemperatureResults; members: ReadonlyArray<{ T: number; k: number; se: number | null }> }) {
  const err = members.map((m) => (m.se ? m.se / m.k : 0));
  const xs = members.map((m) => x(m.T));
  const eyBand = eyringBandOf(members, r.weighted);
  const bx = r.band.map((b) => x(b.temperatureK)),
    ex = eyBand.map((b) => x(b.temperatureK));
  return (
    <section className="grid gap-4 lg:grid-cols-2">
      <RatePlot
        title="Arrhenius plot"
        label="Arrhenius plot: ln k against 1000/T"
        yTitle="ln (k / s⁻¹)"
        data={[
          ...bandTraces("95 % confidence band", bx, r.band.map((b) => b.low), r.band.map((b) => b.high), BAND),
          lineTrace("weighted line", bx, r.band.map((b) => b.lnK), 1, { color: "#0f5c63" }),
          errorMarkerTrace("ln k ± SE", xs, members.map((m) => Math.log(m.k)), err, { size: 8, color: "#2b50c8" }),
        ]}
      />
      <RatePlot
        title="Eyring plot"
        label="Eyring plot: ln(k/T) against 1000/T"
        yTitle="ln (k/T)"
        data={[
          ...bandTraces("95 % confidence band", ex, eyBand.map((b) => b.low), eyBand.map((b) => b.high), BAND),
          lineTrace(r.weighted ? "weighted line" : "line", ex, eyBand.map((b) => b.lnKOverT), 1, { color: "#d55e00" }),
          errorMarkerTrace("ln(k/T) ± SE", xs, members.map((m) => Math.log(m.k / m.T)), err, { size: 8, color: "#7b2d8e" }),
        ]}
      />
    </section>
  );
}

function RatePlot({ title, label, yTitle, data }: { title: string; label: string; yTitle: string; data: Data[] }) {
  return (
    <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
      <h2 className="mb-1 text-sm font-semibold">{title}</h2>
      <Plot label={label} height={300} data={data} layout={{ xaxis: { title: { text: "1000 / T (K⁻¹)" } }, yaxis: { title: { text: yTitle } } }} />
    </div>
  );
}
