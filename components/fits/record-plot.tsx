// The plot on a fit record and its share page: the data, the fitted curve and the residuals, drawn on the server as
// SVG (readable without scripts, at any width), the same scene the PDF report draws.
import { getDb } from "@/db";
import type { FitRecordView } from "@/lib/fits";
import { recordUnits } from "@/lib/fits";
import { fitPlotScene, plotAxisLabel, sceneToSvg } from "@/lib/reports/fit-plot";
import { readSeries } from "@/lib/runs";

export async function RecordPlot({ rec, labId }: { rec: FitRecordView; labId: number }) {
  const { t, y } = await readSeries(await getDb(), labId, rec.run.id, rec.series.id);
  const units = recordUnits(rec.results, rec.options);
  const scene = fitPlotScene({ t, y, options: rec.options, results: rec.results, model: rec.primary.model, yUnit: plotAxisLabel(rec.results.quantity, units.y) });
  const svg = sceneToSvg(scene, `${rec.title}, version ${rec.version}: data, fitted curve and residuals`);
  return (
    <figure className="mb-6 rounded-cell bg-paper-raised p-4 shadow-lift" data-testid="record-plot">
      {/* Our own SVG: every text in it is escaped (sceneToSvg). */}
      <div className="w-full overflow-hidden" dangerouslySetInnerHTML={{ __html: svg }} />
      <figcaption className="mt-2 flex flex-wrap items-center gap-x-5 gap-y-1 text-xs text-ink-700">
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-2 w-2 rounded-full bg-[#2b50c8]" />
          {scene.legend.points}
        </span>
        {scene.legend.outside && (
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden className="inline-block h-2.5 w-2.5 rounded-full border border-[#8a94a6]" />
            {scene.legend.outside}
          </span>
        )}
        {scene.legend.line && (
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden className="inline-block h-0.5 w-5 bg-[#d55e00]" />
            {scene.legend.line}
          </span>
        )}
        <span>Residuals = reading − curve, fitted points only.</span>
      </figcaption>
    </figure>
  );
}
