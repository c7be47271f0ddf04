"use client";
// A study: the Arrhenius and Eyring plots, the results with uncertainties, predictions at a temperature (with their
// cautions), and the members, whose temperatures may be corrected with a reason (a new version).
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Plot } from "@/components/plot/plot";
import { ReviewPanel } from "@/components/reviews/review-panel";
import { ShareLinks } from "@/components/reviews/share-links";
import { Button, buttonLinkClass } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { formatNumber, formatSeconds, formatWithUncertainty, superscript } from "@/lib/format/number";
import { KELVIN_OFFSET } from "@/lib/kinetics/constants";
import { halfLife, t90 } from "@/lib/kinetics/quantities";
import { celsiusToKelvin, eyringBand, predictRateConstant, type RatePoint } from "@/lib/kinetics/temperature";
import type { StudyGlobal, StudyRecord } from "@/lib/studies";
import { GlobalFitSection } from "./global-fit";
import { problemText, sendJson } from "@/lib/http/client";


const kj = (v: number | null | undefined) => (v == null ? null : v / 1000);

export function StudyView({
  study,
  canWrite,
  demoNote,
  candidates,
  review,
  residualSvg,
  canShare = false,
}: {
  study: StudyRecord;
  canWrite: boolean;
  demoNote: boolean;
  candidates: Array<{ id: number; label: string }>;
  review: { isAuthor: boolean; mayDecide: boolean; maySubmit: boolean };
  /** The global fit's per-run residual panels, drawn on the server. */
  residualSvg: string | null;
  canShare?: boolean;
}) {
  const router = useRouter();
  const toast = useToast();
  const isNewest = study.newest_id === study.id;
  const [temps, setTemps] = useState<Record<number, string>>({});
  const [reasons, setReasons] = useState<Record<number, string>>({});
  const [why, setWhy] = useState("");
  const [target, setTarget] = useState<string>(String(study.options.target_c ?? 25));
  const [busy, setBusy] = useState(false);
  const [name, setName] = useState(study.name);
  const [removed, setRemoved] = useState<number[]>([]);
  const [added, setAdded] = useState<string>("");
  const prediction = useMemo(() => {
    if (study.results.kind !== "temperature") return null;
    const weighted = study.results.weighted;
    const points: RatePoint[] = study.members.map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c!), k: m.k, se: weighted ? m.se : null }));
    const c = Number(target.replace(",", "."));
    if (!target.trim() || !Number.isFinite(c) || points.length < 3) return null;
    try {
      const p = predictRateConstant(points, celsiusToKelvin(c));
      return { c, ...p, t90: t90(p.k).value, t90pi: [t90(p.pi95[1]).value, t90(p.pi95[0]).value], half: halfLife(p.k).value };
    } catch {
      return null;
    }
  }, [target, study]);

  if (study.results.kind === "excess") {
    const r = study.results;
    return (
      <div>
        <h1 className="text-2xl font-semibold">{study.name}</h1>
        <p className="num mt-4 font-mono text-2xl">k2 = {formatWithUncertainty(r.k2.value, r.k2.se)} L mol⁻¹ s⁻¹</p>
        <p className="text-sm text-ink-500">Intercept {formatWithUncertainty(r.intercept.value, r.intercept.se)} s⁻¹ (a solvent or reverse path); r² {r.r2.toFixed(5)}.</p>
        <div className="mt-6 space-y-6">
          <GlobalFitSection g={r.global} twoStage={r.k2} residualSvg={residualSvg} />
          <ReviewPanel record={{ type: "study", id: study.id }} {...review} />
      {canShare && <ShareLinks record={{ type: "study", id: study.id }} />}
        </div>
      </div>
    );
  }
  const r = study.results;
  const members = study.members.map((m) => ({ ...m, T: celsiusToKelvin(m.temperature_used_c!) }));
  const x = (T: number) => 1000 / T;

  async function saveChange() {
    setBusy(true);
    // The picked fit by its label (or a number typed directly).
    const addId = candidates.find((c) => c.label === added)?.id ?? Number(added);
    const body = {
      reason: why,
      name,
      options: { ...study.options, target_c: Number(target) },
      members: [...study.members.filter((m) => !removed.includes(m.fitId)).map((m) => {
        const t = temps[m.fitId];
        const changed = t !== undefined && t.trim() !== "" && Number(t) !== m.temperature_used_c;
        return {
          fitId: m.fitId,
          ...(changed ? { temperature_c: Number(t.replace(",", ".")), temperature_reason: reasons[m.fitId] } : m.temperature_reason ? { temperature_c: m.temperature_c, temperature_reason: m.temperature_reason } : {}),
        };
      }), ...(Number.isInteger(addId) && addId > 0 ? [{ fitId: addId }] : [])],
    };
    let out: { id: number; version: number };
    try {
      out = await sendJson<{ id: number; version: number }>(`/api/studies/${study.id}`, { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    } finally {
      setBusy(false);
    }
    toast(`Saved as version ${out.version}.`, "pass");
    router.push(`/studies/${out.id}`);
  }

  const lnk = members.map((m) => Math.log(m.k));
  // The Eyring line's band from the same regression on ln(k/T) (its ΔH‡ and ΔS‡ are the stored results).
  const eyBand = (() => {
    if (members.length < 3) return [];
    const lo = Math.min(...members.map((m) => m.T)) - 5,
      hi = Math.max(...members.map((m) => m.T)) + 5;
    try {
      return eyringBand(members.map((m) => ({ temperatureK: m.T, k: m.k, se: r.weighted ? m.se : null })), Array.from({ length: 41 }, (_, i) => lo + ((hi - lo) * i) / 40));
    } catch {
      return [];
    }
  })();
  const err = members.map((m) => (m.se ? m.se / m.k : 0));
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">{study.name}</h1>
          <p className="text-sm text-ink-500">
            Version {study.version} of {study.versions.length} · {r.n} rate constants at {r.temperatures ?? r.n} temperatures · weighting {r.weighting} · {study.engine_version}
          </p>
          {demoNote && <p className="mt-1 text-sm text-ink-500">Demo lab: these invented runs were generated with Ea = 82 kJ mol⁻¹, so the study shows the method recovering a known value.</p>}
        </div>
        <div className="flex gap-2">
          <a href={`/api/studies/${study.id}/report`} className={buttonLinkClass("secondary", "md", "text-sm")} data-testid="study-pdf">
            PDF report
          </a>
          <a href={`/api/studies/${study.id}/export`} className={buttonLinkClass("secondary", "md", "text-sm")}>
            Study CSV
          </a>
        </div>
      </header>
      {!isNewest && (
        <p className="rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700">
          Not the newest version. <Link className="font-semibold underline" href={`/studies/${study.newest_id}`}>Open the newest</Link>.
        </p>
      )}
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
      <section className="grid gap-4 lg:grid-cols-2">
        <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <h2 className="mb-1 text-sm font-semibold">Arrhenius plot</h2>
          <Plot
            label="Arrhenius plot: ln k against 1000/T"
            height={300}
            data={[
              { type: "scatter", mode: "lines", name: "95 % band", x: r.band.map((b) => x(b.temperatureK)), y: r.band.map((b) => b.high), line: { width: 0 }, showlegend: false, hoverinfo: "skip" },
              { type: "scatter", mode: "lines", name: "95 % confidence band", x: r.band.map((b) => x(b.temperatureK)), y: r.band.map((b) => b.low), fill: "tonexty", fillcolor: "rgba(26,138,148,0.18)", line: { width: 0 } },
              { type: "scatter", mode: "lines", name: "weighted line", x: r.band.map((b) => x(b.temperatureK)), y: r.band.map((b) => b.lnK), line: { color: "#0f5c63" } },
              { type: "scatter", mode: "markers", name: "ln k ± SE", x: members.map((m) => x(m.T)), y: lnk, error_y: { type: "data", array: err, visible: true }, marker: { size: 8, color: "#2b50c8" } },
            ] as never}
            layout={{ xaxis: { title: { text: "1000 / T (K⁻¹)" } }, yaxis: { title: { text: "ln (k / s⁻¹)" } } } as never}
          />
        </div>
        <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <h2 className="mb-1 text-sm font-semibold">Eyring plot</h2>
          <Plot
            label="Eyring plot: ln(k/T) against 1000/T"
            height={300}
            data={[
              { type: "scatter", mode: "lines", name: "95 % band", x: eyBand.map((b) => x(b.temperatureK)), y: eyBand.map((b) => b.high), line: { width: 0 }, showlegend: false, hoverinfo: "skip" },
              { type: "scatter", mode: "lines", name: "95 % confidence band", x: eyBand.map((b) => x(b.temperatureK)), y: eyBand.map((b) => b.low), fill: "tonexty", fillcolor: "rgba(26,138,148,0.18)", line: { width: 0 } },
              { type: "scatter", mode: "lines", name: r.weighted ? "weighted line" : "line", x: eyBand.map((b) => x(b.temperatureK)), y: eyBand.map((b) => b.lnKOverT), line: { color: "#d55e00" } },
              { type: "scatter", mode: "markers", name: "ln(k/T) ± SE", x: members.map((m) => x(m.T)), y: members.map((m) => Math.log(m.k / m.T)), error_y: { type: "data", array: err, visible: true }, marker: { size: 8, color: "#7b2d8e" } },
            ] as never}
            layout={{ xaxis: { title: { text: "1000 / T (K⁻¹)" } }, yaxis: { title: { text: "ln (k/T)" } } } as never}
          />
        </div>
      </section>
      <GlobalFitSection g={r.global} twoStage={r.ea} residualSvg={residualSvg} />
      <ReviewPanel record={{ type: "study", id: study.id }} {...review} />
      {canShare && <ShareLinks record={{ type: "study", id: study.id }} />}
      <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Prediction">
        <h2 className="mb-3 text-lg font-semibold">Prediction at a temperature</h2>
        <div className="flex flex-wrap items-end gap-4">
          <div className="w-48">
            <Input label="Target temperature (°C)" inputMode="decimal" value={target} onChange={(e) => setTarget(e.target.value)} />
          </div>
          {prediction && (
            <div className="num font-mono text-sm" data-testid="prediction">
              <p>
                k = {formatNumber(prediction.k, 4)} s⁻¹ (95 % prediction interval {formatNumber(prediction.pi95[0], 3)} … {formatNumber(prediction.pi95[1], 3)})
              </p>
              <p>
                t½ = {formatSeconds(prediction.half)} · t90 = {formatSeconds(prediction.t90)} (95 % PI {formatSeconds(prediction.t90pi[0])} … {formatSeconds(prediction.t90pi[1])})
              </p>
            </div>
          )}
        </div>
        {prediction?.warning && (
          <p className="mt-3 rounded-cell border-l-4 border-caution-700 bg-caution-100 px-3 py-2 text-sm text-caution-700" data-testid="extrapolation">
            {prediction.warning}
          </p>
        )}
        <p className="mt-3 text-sm text-ink-700" data-testid="caution">
          Caution: predictions are estimates for qualified review, not release or shelf-life decisions; local regulations and the lab&apos;s SOPs govern shelf-life
          claims.
        </p>
      </section>
      <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Members">
        <h2 className="mb-3 text-lg font-semibold">Members</h2>
        <table className="w-full text-sm [&_td]:px-2 [&_th]:px-2">
          <thead>
            <tr className="text-left text-ink-500">
              <th className="py-1">Fit</th>
              <th>Run</th>
              <th className="text-right">k (s⁻¹)</th>
              <th className="text-right">Residual (ln k)</th>
              <th>Temperature (°C)</th>
              <th>Reason for a changed temperature</th>
              {canWrite && isNewest && <th>Leave out</th>}
            </tr>
          </thead>
          <tbody>
            {study.members.map((m, i) => (
              <tr key={m.fitId} className="border-t border-ink-100 align-top">
                <td className="py-1.5">
                  <Link className="text-quartz-700 hover:underline" href={`/fits/${m.fitId}`}>
                    {m.fit_title}
                  </Link>{" "}
                  <span className="text-ink-500">v{m.fit_version}</span>
                </td>
                <td>{m.run_name}</td>
                <td className="num text-right font-mono">{formatWithUncertainty(m.k, m.se)}</td>
                <td className="num text-right font-mono">{r.residuals[i] ? formatNumber(r.residuals[i]!.residual, 3) : "—"}</td>
                <td>
                  {canWrite && isNewest ? (
                    <input
                      aria-label={`Temperature of ${m.run_name}`}
                      className="h-8 w-24 rounded-cell border border-ink-300 px-2"
                      value={temps[m.fitId] ?? String(m.temperature_used_c)}
                      onChange={(e) => setTemps({ ...temps, [m.fitId]: e.target.value })}
                    />
                  ) : (
                    m.temperature_used_c
                  )}
                  {m.temperature_reason && <span className="block text-xs text-ink-500">run says {m.run_temperature_c ?? "nothing"} °C</span>}
                </td>
                <td>
                  {canWrite && isNewest && temps[m.fitId] !== undefined && Number(temps[m.fitId]) !== m.temperature_used_c ? (
                    <input aria-label={`Why ${m.run_name} is at this temperature`} className="h-8 w-full rounded-cell border border-ink-300 px-2" value={reasons[m.fitId] ?? ""} onChange={(e) => setReasons({ ...reasons, [m.fitId]: e.target.value })} />
                  ) : (
                    <span className="text-ink-500">{m.temperature_reason ?? ""}</span>
                  )}
                </td>
                {canWrite && isNewest && (
                  <td>
                    <input type="checkbox" aria-label={`Leave ${m.run_name} out`} checked={removed.includes(m.fitId)} onChange={(e) => setRemoved(e.target.checked ? [...removed, m.fitId] : removed.filter((x) => x !== m.fitId))} />
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
        {canWrite && isNewest && (
          <div className="mt-4 flex flex-wrap items-end gap-3">
            <div className="w-72">
              <Input label="Study name" value={name} onChange={(e) => setName(e.target.value)} />
            </div>
            <div className="w-96 max-w-full">
              <Input label="Add a fit" list="study-fit-choices" value={added} onChange={(e) => setAdded(e.target.value)} hint="Type part of its title, run or temperature and pick it." />
              <datalist id="study-fit-choices">
                {candidates.map((c) => (
                  <option key={c.id} value={c.label} />
                ))}
              </datalist>
            </div>
            <div className="w-96">
              <Input label="Why this new version (required)" value={why} onChange={(e) => setWhy(e.target.value)} />
            </div>
            <Button onClick={saveChange} disabled={busy || why.trim().length < 3} data-testid="save-study">
              Save version {study.version + 1}
            </Button>
          </div>
        )}
      </section>
      <section aria-label="Versions">
        <h2 className="mb-2 text-lg font-semibold">Versions</h2>
        <ol className="space-y-1 text-sm" data-testid="study-versions">
          {study.versions.map((v) => (
            <li key={v.id}>
              <Link className="font-semibold text-quartz-700 hover:underline" href={`/studies/${v.id}`}>
                Version {v.version}
              </Link>{" "}
              · {v.created_at.slice(0, 16).replace("T", " ")} UTC · {v.author ?? "—"}
              {v.reason ? ` · ${v.reason}` : ""}
            </li>
          ))}
        </ol>
      </section>
      <p className="text-xs text-ink-500">Temperatures in kelvin are °C + {KELVIN_OFFSET}; R = 8.314462618 J mol⁻¹ K⁻¹ and kB/h exact (SI 2019).</p>
    </div>
  );
}
