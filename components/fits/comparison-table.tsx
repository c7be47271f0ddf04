"use client";
// The model comparison: each model's parameters with their units, standard errors and intervals, and the statistics
// that compare them (AICc and Akaike weights only between models in the data's units).
import { Badge } from "@/components/ui/badge";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { modelById, parameterUnit, perMinuteFactor } from "@/lib/kinetics/models";
import type { fitSeriesWithOptions } from "@/lib/kinetics/workspace";

type Outcome = Pick<ReturnType<typeof fitSeriesWithOptions>, "models" | "favoured" | "notes">;
type ModelRow = Outcome["models"][number];
const dash = (v: number | null | undefined, f: (x: number) => string) => (v === null || v === undefined ? "—" : f(v));
const inTime = (v: { value: number; se: number | null } | null, perMinute: boolean) =>
  v ? `${formatWithUncertainty(v.value / (perMinute ? 60 : 1), v.se === null ? null : v.se / (perMinute ? 60 : 1))} ${perMinute ? "min" : "s"}` : "—";

const STAT_ROWS: Array<[string, (m: ModelRow, perMinute: boolean) => string]> = [
  ["points fitted", (m) => String(m.result.n)],
  ["SSR", (m) => formatNumber(m.result.ssr, 4)],
  ["r²", (m) => dash(m.result.r2, (v) => v.toFixed(5))],
  ["RMSE", (m) => formatNumber(m.result.rmse, 3)],
  ["AICc", (m) => dash(m.result.aicc, (v) => v.toFixed(2))],
  ["Akaike weight", (m) => dash(m.akaikeWeight, (v) => v.toFixed(3))],
  ["runs of residual signs", (m) => dash(m.result.runs, (v) => `${v}${m.result.runs_p !== null ? ` (p ${m.result.runs_p.toFixed(2)})` : ""}`)],
  ["Durbin–Watson", (m) => dash(m.result.durbin_watson, (v) => v.toFixed(2))],
  ["t½", (m, pm) => inTime(m.halfLife, pm)],
  ["t90", (m, pm) => inTime(m.t90, pm)],
];

export function ComparisonTable({ outcome, perMinute, yUnit, stale }: { outcome: Outcome; perMinute: boolean; yUnit: string; stale: boolean }) {
  const units = { y: yUnit, t: perMinute ? "min" : "s" };
  const scale = (model: string, name: string) => (perMinute ? perMinuteFactor(model, name) : 1);
  const paramNames = [...new Set(outcome.models.flatMap((m) => m.result.parameters.map((p) => p.name)))];
  return (
    <section className={`rounded-cell bg-paper-raised p-4 shadow-lift ${stale ? "opacity-70" : ""}`} aria-label="Model comparison" aria-busy={stale}>
      <h2 className="mb-2 text-lg font-semibold">Model comparison</h2>
      {outcome.favoured && (
        <p className="mb-3 text-sm" data-testid="favoured">
          <Badge tone="pass">Favoured: {outcome.favoured.model}</Badge> <span className="text-ink-700">{outcome.favoured.why}</span>
        </p>
      )}
      {outcome.notes.map((n) => (
        <p key={n} className="mb-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">
          {n}
        </p>
      ))}
      <div className="relative overflow-x-auto">
        <table className="w-full text-sm" data-testid="comparison">
          <thead>
            <tr className="border-b border-ink-100 text-left text-xs uppercase tracking-wide text-ink-500">
              <th className="py-2 pr-4" scope="col">
                Statistic
              </th>
              {outcome.models.map((m) => (
                <th key={m.model} scope="col" data-model={m.model} className="pr-4 normal-case">
                  <span className="text-sm font-semibold text-ink-900">{m.model}</span>
                  {outcome.favoured?.model === m.model && <Badge tone="pass">favoured</Badge>}
                  {!m.result.converged && <Badge tone="fault">no fit</Badge>}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {paramNames.map((name) => (
              <tr key={name} className="border-b border-ink-100 align-top">
                <th scope="row" className="py-1.5 pr-4 text-left font-mono text-xs font-normal text-ink-700">
                  {name}
                </th>
                {outcome.models.map((m) => {
                  const p = m.result.parameters.find((q) => q.name === name);
                  const f = scale(m.model, name);
                  const unit = parameterUnit(m.model, name, units);
                  return (
                    <td key={m.model} className="num pr-4 font-mono text-xs" data-model={m.model} data-param={name}>
                      {!p ? "" : p.value === null ? "—" : formatWithUncertainty(p.value * f, p.se === null ? null : p.se * f)}
                      {p && p.value !== null && unit ? <span data-unit> {unit}</span> : null}
                      {p?.se_with_calibration !== undefined && <span className="block text-ink-500">SE with calibration ±{formatNumber(p.se_with_calibration * f, 3)}</span>}
                      {p?.held_from ? ` (from ${modelById(p.held_from)?.label.toLowerCase() ?? p.held_from})` : p?.fixed ? " (fixed)" : p?.ci95 ? <span className="block text-ink-500">95 % CI {formatNumber(p.ci95[0] * f, 4)} … {formatNumber(p.ci95[1] * f, 4)}</span> : null}
                    </td>
                  );
                })}
              </tr>
            ))}
            {STAT_ROWS.map(([label, get]) => (
              <tr key={label} className="border-b border-ink-100">
                <th scope="row" className="py-1.5 pr-4 text-left text-xs font-normal text-ink-700">
                  {label}
                </th>
                {outcome.models.map((m) => (
                  <td key={m.model} className="num pr-4 font-mono text-xs">
                    {get(m, perMinute)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {outcome.models.flatMap((m) =>
        [...(m.result.converged ? [] : [m.result.message]), ...m.result.warnings].map((w) => (
          <p key={`${m.model}-${w}`} className="mt-2 text-xs text-caution-700">
            {m.model}: {w}
          </p>
        )),
      )}
      <p className="mt-2 text-xs text-ink-500">
        AICc and Akaike weights compare only models whose sum of squares is in the data&apos;s units (not the straight-line methods, which work in log units or on pairs).
      </p>
    </section>
  );
}
