"use client";
// The standards with the fitted line, and the residuals (coloured as a warning when the linearity check fails).
import { Plot } from "@/components/plot/plot";
import { lineTrace, markerTrace } from "@/components/plot/traces";
import type { Calibration } from "@/lib/kinetics/quantities";

export function CalibrationPlots({ standards, cal, unit }: { standards: Array<{ concentration: number; absorbance: number }>; cal: Calibration | null; unit: string }) {
  const xs = standards.map((s) => s.concentration);
  const lo = Math.min(0, ...xs),
    hi = Math.max(...xs, 0) * 1.05;
  const xaxis = { title: { text: `c (${unit})` } };
  return (
    <section className="grid gap-4 lg:grid-cols-2">
      <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
        <h2 className="mb-1 text-sm font-semibold text-ink-700">Standards and line</h2>
        <Plot
          label="Calibration standards and the fitted line"
          height={260}
          data={[
            markerTrace("standards", xs, standards.map((s) => s.absorbance), 1, { size: 8, color: "#1f6f78" }),
            ...(cal ? [lineTrace("line", [lo, hi], [cal.intercept + cal.slope * lo, cal.intercept + cal.slope * hi], 1, { color: "#d55e00" })] : []),
          ]}
          layout={{ xaxis, yaxis: { title: { text: "A (AU)" } }, showlegend: false }}
        />
      </div>
      <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
        <h2 className="mb-1 text-sm font-semibold text-ink-700">Residuals</h2>
        <Plot
          label="Calibration residuals"
          height={260}
          data={cal ? [markerTrace("residual", xs, [...cal.fit.residuals], 1, { size: 8, color: cal.linearity.linear ? "#1f6f78" : "#b35c00" })] : []}
          layout={{ xaxis, yaxis: { title: { text: "A − line" }, zeroline: true }, showlegend: false }}
        />
      </div>
    </section>
  );
}
