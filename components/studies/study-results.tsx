"use client";
// A temperature study's results: Ea and ln A with their SEs, interval and correlation, Eyring's ΔH‡ and ΔS‡, Q10
// between neighbouring temperatures, and the engine's warnings.
import { formatNumber, formatWithUncertainty, superscript } from "@/lib/format/number";
import type { StudyRecord } from "@/lib/studies";

type TemperatureResults = Extract<StudyRecord["results"], { kind: "temperature" }>;
const kj = (v: number | null | undefined) => (v == null ? null : v / 1000);

export function StudyResults({ r }: { r: TemperatureResults }) {
  return (
    <section className="grid gap-4 rounded-cell bg-paper-raised p-5 shadow-lift md:grid-cols-3" aria-label="Results">
      <div>
        <p className="text-sm text-ink-500">Activation energy</p>
        <p className="num font-mono text-2xl" data-testid="study-ea">
          Ea = {formatWithUncertainty(kj(r.ea.value), kj(r.ea.se))} kJ mol⁻¹
        </p>
        {r.ea.ci95 && <p className="text-sm">95 % CI {formatNumber(kj(r.ea.ci95[0]), 4)} … {formatNumber(kj(r.ea.ci95[1]), 4)} kJ mol⁻¹</p>}
        <p className="text-sm">
          ln A = {formatWithUncertainty(r.lnA.value, r.lnA.se)} (A = {formatNumber(Math.exp(r.lnA.value), 3)} s{superscript(-1)})
        </p>
        {r.corrEaLnA !== null && <p className="text-xs text-ink-500">Correlation of Ea and ln A: {r.corrEaLnA.toFixed(4)}; quote them together.</p>}
      </div>
      <div>
        <p className="text-sm text-ink-500">Eyring (transmission coefficient 1)</p>
        <p className="num font-mono">ΔH‡ = {formatWithUncertainty(kj(r.eyring.dH.value), kj(r.eyring.dH.se))} kJ mol⁻¹</p>
        <p className="num font-mono">ΔS‡ = {formatWithUncertainty(r.eyring.dS.value, r.eyring.dS.se)} J mol⁻¹ K⁻¹</p>
        <p className="mt-2 text-sm text-ink-500">r² of the Arrhenius line {r.r2 === null ? "—" : r.r2.toFixed(5)}</p>
      </div>
      <div>
        <p className="text-sm text-ink-500">Q10 between neighbouring temperatures</p>
        <ul className="num font-mono text-sm">
          {r.q10.map((q) => (
            <li key={`${q.from_c}-${q.to_c}`}>
              {q.from_c.toFixed(1)} → {q.to_c.toFixed(1)} °C: {q.q10.toFixed(3)}
            </li>
          ))}
        </ul>
      </div>
      {r.warnings.map((w) => (
        <p key={w} className="rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700 md:col-span-3">
          {w}
        </p>
      ))}
    </section>
  );
}
