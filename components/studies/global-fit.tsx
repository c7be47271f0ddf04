// "All curves fitted together" beside the two-stage result: Ea and kref (temperature studies) or k2 (excess series) from
// one least-squares fit over every member's points, their correlation, each run's k and share of the residuals, and
// whether the two routes agree within their uncertainties.
import { formatNumber, formatSeconds, formatWithUncertainty } from "@/lib/format/number";
import type { StudyGlobal } from "@/lib/studies";

export function GlobalFitSection({ g, twoStage, residualSvg }: { g: StudyGlobal | undefined; twoStage: { value: number; se: number | null }; residualSvg?: string | null }) {
  if (!g) return null;
  const excess = g.form === "excess";
  return (
    <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="All curves fitted together" data-testid="global-fit">
      <h2 className="text-lg font-semibold">All curves fitted together</h2>
      <p className="mb-3 text-sm text-ink-700">
        {excess ? (
          <>
            One least-squares fit of every member&apos;s points at once (first order, pseudo-first order in the reagent in excess: k<sub>obs</sub> = k2·[B]0 with k2 shared, each run&apos;s a0
            and A∞ its own), beside the two-stage route above (each run fitted, then k<sub>obs</sub> on [B]0).
          </>
        ) : (
          <>
            One least-squares fit of every member&apos;s points at once (first order; Ea and k<sub>ref</sub> shared, each run&apos;s a0 and A∞ its own), beside the two-stage route above
            (each run fitted, then ln k on 1/T).
          </>
        )}{" "}
        Runs that differ in length, noise and coverage weigh in by their points here.
      </p>
      {!g.available ? (
        <p className="rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">Not available for this study: {g.reason}</p>
      ) : !g.converged ? (
        <p className="rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">{g.message}</p>
      ) : (
        <>
          <dl className="grid gap-4 md:grid-cols-3">
            {excess ? (
              <div>
                <dt className="text-sm text-ink-500">k2, all curves together</dt>
                <dd className="num font-mono text-xl" data-testid="global-k2">
                  {g.k2?.value == null ? "—" : formatWithUncertainty(g.k2.value, g.k2.se)} L mol⁻¹ s⁻¹
                </dd>
                <dd className="text-xs text-ink-500">two-stage: {formatWithUncertainty(twoStage.value, twoStage.se)} L mol⁻¹ s⁻¹</dd>
              </div>
            ) : (
            <>
            <div>
              <dt className="text-sm text-ink-500">Ea, all curves together</dt>
              <dd className="num font-mono text-xl" data-testid="global-ea">
                {g.ea?.value == null ? "—" : formatWithUncertainty(g.ea.value / 1000, g.ea.se === null ? null : g.ea.se / 1000)} kJ mol⁻¹
              </dd>
              <dd className="text-xs text-ink-500">two-stage: {formatWithUncertainty(twoStage.value / 1000, twoStage.se === null ? null : twoStage.se / 1000)} kJ mol⁻¹</dd>
            </div>
            <div>
              <dt className="text-sm text-ink-500">k<sub>ref</sub> at {formatNumber(g.tref_c ?? null, 4)} °C</dt>
              <dd className="num font-mono text-xl">{g.kref?.value == null ? "—" : formatWithUncertainty(g.kref.value, g.kref.se)} s⁻¹</dd>
              <dd className="text-xs text-ink-500">correlation of Ea and k<sub>ref</sub>: {g.correlation_ea_kref == null ? "—" : g.correlation_ea_kref.toFixed(3)}</dd>
            </div>
            </>
            )}
            <div>
              <dt className="text-sm text-ink-500">The two routes</dt>
              <dd className="text-sm" data-testid="global-agreement">
                {g.agreement?.agree == null
                  ? "Cannot be compared (an uncertainty is missing)."
                  : g.agreement.agree
                    ? `Agree within their uncertainties (difference ${excess ? `${formatNumber(g.agreement.difference, 3)} L mol⁻¹ s⁻¹` : `${formatNumber(g.agreement.difference / 1000, 3)} kJ mol⁻¹`}, ${Math.abs(g.agreement.z!).toFixed(1)} combined SE).`
                    : `Differ by ${Math.abs(g.agreement.z!).toFixed(1)} combined SE (${excess ? `${formatNumber(g.agreement.difference, 3)} L mol⁻¹ s⁻¹` : `${formatNumber(g.agreement.difference / 1000, 3)} kJ mol⁻¹`}): look at the runs below before relying on either.`}
              </dd>
              <dd className="mt-1 text-xs text-ink-500">
                {g.n} points, {g.dof} degrees of freedom. {g.message}
              </dd>
            </div>
          </dl>
          {(g.warnings ?? []).map((w) => (
            <p key={w} className="mt-3 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">
              {w}
            </p>
          ))}
          <div className="relative mt-4 overflow-x-auto">
            <table className="w-full border-collapse text-sm">
              <caption className="sr-only">Each run in the global fit</caption>
              <thead>
                <tr className="text-left text-ink-700">
                  <th className="border-b border-ink-100 px-2 py-1">Run</th>
                  <th className="border-b border-ink-100 px-2 py-1 text-right">{excess ? "[B]0 (mol L⁻¹)" : "T (°C)"}</th>
                  <th className="border-b border-ink-100 px-2 py-1 text-right">points</th>
                  <th className="border-b border-ink-100 px-2 py-1 text-right">k from the shared law (s⁻¹)</th>
                  <th className="border-b border-ink-100 px-2 py-1 text-right">share of residual SS</th>
                  <th className="border-b border-ink-100 px-2 py-1 text-right">runs test z</th>
                </tr>
              </thead>
              <tbody>
                {(g.runs ?? []).map((r) => (
                  <tr key={r.fit_id}>
                    <td className="border-b border-ink-100 px-2 py-1">{r.run_name}</td>
                    <td className="num border-b border-ink-100 px-2 py-1 text-right font-mono">{excess ? formatNumber(r.excess_mol_l ?? null, 4) : formatNumber(r.temperature_c, 4)}</td>
                    <td className="num border-b border-ink-100 px-2 py-1 text-right font-mono">{r.n}</td>
                    <td className="num border-b border-ink-100 px-2 py-1 text-right font-mono">{r.k == null ? "—" : formatWithUncertainty(r.k, r.se_k)}</td>
                    <td className="num border-b border-ink-100 px-2 py-1 text-right font-mono">{r.ssr_share == null ? "—" : `${(r.ssr_share * 100).toFixed(1)} %`}</td>
                    <td className="num border-b border-ink-100 px-2 py-1 text-right font-mono">{r.runs_z == null ? "—" : r.runs_z.toFixed(2)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {g.prediction && (
            <p className="mt-4 text-sm" data-testid="global-prediction">
              From the global fit at {g.prediction.target_c} °C: k = {formatNumber(g.prediction.k, 4)} s⁻¹ (95 % confidence interval of the mean rate {formatNumber(g.prediction.ci95[0], 3)} …{" "}
              {formatNumber(g.prediction.ci95[1], 3)}), t90 {formatSeconds(g.prediction.t90_s)}{g.prediction.extrapolated ? "; extrapolated beyond the measured temperatures" : ""}.
            </p>
          )}
          {residualSvg && (
            <figure className="mt-4" data-testid="global-residuals">
              <figcaption className="mb-1 text-sm font-semibold">Each run&apos;s residuals under the shared law (one scale)</figcaption>
              {/* Our own SVG: every text in it is escaped (sceneToSvg). */}
              <div className="w-full overflow-hidden" dangerouslySetInnerHTML={{ __html: residualSvg }} />
            </figure>
          )}
          <p className="mt-3 text-xs text-ink-500">Estimates for qualified review: shelf-life and release decisions follow the lab&apos;s SOPs and local regulations.</p>
        </>
      )}
    </section>
  );
}
