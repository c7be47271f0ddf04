// A fit record version: the number with its uncertainty, the review, parameters, what was done, versions.
import Link from "next/link";
import { notFound } from "next/navigation";
import { RecordPlot } from "@/components/fits/record-plot";
import { ReviewPanel } from "@/components/reviews/review-panel";
import { ShareLinks } from "@/components/reviews/share-links";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { listAuditTrail } from "@/lib/audit";
import { auditSentence } from "@/lib/audit/sentences";
import { AppError } from "@/lib/errors";
import { getFitRecord, recordParameterUnit, recordUnits, versionsOfRecord, type FitRecordView as FitRecordData } from "@/lib/fits";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { verifyFitVersion, type RecordIntegrity } from "@/lib/integrity";
import { runWavelengthMismatch } from "@/lib/methods";
import { can } from "@/lib/permissions";
import { buttonLinkClass } from "@/components/ui/button";


/**
 * One fit record version as a page body: used by /fits/[id] and by share links (/share/[token]). Without a user it is
 * the read-only view an outside reviewer opens from a link: the record's numbers, no actions, exports or audit trail.
 */
export async function FitRecordView({ user, labId: labIdGiven, id, banner }: { user: SignedInUser | null; labId?: number; id: number; banner?: React.ReactNode }) {
  const db = await getDb();
  const labId = user?.labId ?? labIdGiven!;
  const outside = user === null;
  const rec = await getFitRecord(db, labId, Number(id)).catch((e: unknown) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const versions = await versionsOfRecord(db, labId, rec.record_id!);
  const audit = outside ? [] : await listAuditTrail(db, labId, { limit: 200, objectType: "fit", objectId: String(rec.record_id) });
  const newest = versions.at(-1)!;
  const k = rec.primary.k;
  const units = recordUnits(rec.results, rec.options);
  const integrity = await verifyFitVersion(db, labId, rec.id);
  const mismatch = await runWavelengthMismatch(db, labId, rec.run.id);
  return (
    <>
      <PageHeader
        title={rec.title}
        lede={`Version ${rec.version} of ${versions.length} · ${rec.run.name} · ${rec.series.name} · saved ${rec.created_at.slice(0, 16).replace("T", " ")} UTC by ${rec.author ?? "—"}`}
        actions={
          outside ? undefined : (
          <div className="flex flex-wrap gap-2">
            <a className={buttonLinkClass("secondary", "md", "text-sm")} href={`/api/fits/${rec.id}/export?kind=data`} data-testid="export-data">
              Data CSV
            </a>
            <a className={buttonLinkClass("secondary", "md", "text-sm")} href={`/api/fits/${rec.id}/export?kind=parameters`}>
              Parameters CSV
            </a>
            <a className={buttonLinkClass("secondary", "md", "text-sm")} href={`/api/fits/${rec.id}/report`} data-testid="report-pdf">
              PDF report
            </a>
            {can(user, "fit:write") && newest.id === rec.id && (
              <Link className={buttonLinkClass("primary", "md", "px-3 text-sm")} href={`/runs/${rec.run.id}/series/${rec.series.id}/fit?from=${rec.id}`}>
                Change (new version)
              </Link>
            )}
          </div>
          )
        }
      />
      {banner}
      <IntegrityNote integrity={integrity} />
      {mismatch && (
        <p className="mb-4 rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700" data-testid="wavelength-caution">
          Wavelength mismatch: the run&apos;s method ({mismatch.method}) is for {mismatch.method_nm} nm, but this run was measured at {mismatch.run_nm} nm. Its conversion and criteria may not hold; the reason given at assignment is in the audit trail.
        </p>
      )}
      {newest.id !== rec.id && (
        <p className="mb-4 rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700">
          This is not the newest version. <Link className="font-semibold underline" href={`/fits/${newest.id}`}>Open version {newest.version}</Link>.
        </p>
      )}
      <section className="mb-6 rounded-cell bg-paper-raised p-5 shadow-lift">
        <p className="text-sm text-ink-500">Rate constant ({rec.primary.model})</p>
        <p className="num font-mono text-3xl" data-testid="record-k">
          k = {k === null ? "—" : formatWithUncertainty(k, rec.primary.k_se)} {recordParameterUnit(rec.primary.model, "k", units)}
        </p>
        {k !== null && (
          <p className="num mt-1 font-mono text-sm text-ink-700">
            = {formatWithUncertainty(k * 60, rec.primary.k_se === null ? null : rec.primary.k_se * 60)} {recordParameterUnit(rec.primary.model, "k", { ...units, t: "min" })}
          </p>
        )}
        <p className="mt-3 text-xs text-ink-500">
          {rec.engine_version} · content hash <span className="break-all font-mono">{rec.content_hash.slice(0, 16)}…</span> · data SHA-256 <span className="break-all font-mono">{rec.data_sha256.slice(0, 16)}…</span>
        </p>
        {rec.results.favoured && <p className="mt-2 text-sm">Favoured by the statistics: <strong>{rec.results.favoured.model}</strong>: {rec.results.favoured.why}</p>}
        {rec.results.notes.map((n) => (
          <p key={n} className="mt-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">{n}</p>
        ))}
        <p className="mt-3 text-xs text-ink-500">An estimate for qualified review: shelf-life and release decisions follow your lab&apos;s SOPs and local regulations.</p>
      </section>
      <RecordPlot rec={rec} labId={labId} />
      {rec.results.method_evaluation && <MethodVerdict ev={rec.results.method_evaluation} linked={!outside} />}
      {user && (
        <div className="mb-6 space-y-6">
          <ReviewPanel record={{ type: "fit", id: rec.id }} isAuthor={rec.author_id === user.userId} mayDecide={can(user, "review:decide")} maySubmit={can(user, "fit:submit") && newest.id === rec.id} />
          {can(user, "share:create") && <ShareLinks record={{ type: "fit", id: rec.id }} />}
        </div>
      )}
      {/* min-w-0: a grid item may shrink below its table's width, so a wide table scrolls in its own box at phone width. */}
      <div className="grid gap-6 2xl:grid-cols-2">
        <section className="min-w-0">
          <h2 className="mb-2 text-lg font-semibold">Parameters</h2>
          <Table caption="Fitted parameters per model">
            <thead>
              <tr>
                <Th>Model</Th>
                <Th>Parameter</Th>
                <Th numeric>Value ± SE</Th>
                <Th numeric>95 % CI</Th>
              </tr>
            </thead>
            <tbody>
              {rec.results.models.flatMap((m) =>
                m.result.parameters.map((p) => (
                  <tr key={`${m.model}-${p.name}`}>
                    <Td>{m.model}</Td>
                    <Td className="font-mono">{p.name}</Td>
                    <Td numeric>
                      {p.value === null ? (m.result.converged ? "not given" : "no fit") : formatWithUncertainty(p.value, p.se)}
                      {p.value !== null && <span data-unit={`${m.model}.${p.name}`}> {recordParameterUnit(m.model, p.name, units)}</span>}
                      {p.held_from ? ` (from ${p.held_from})` : p.fixed ? " (fixed)" : ""}
                    </Td>
                    <Td numeric>{p.ci95 ? `${formatNumber(p.ci95[0], 4)} … ${formatNumber(p.ci95[1], 4)}` : "—"}</Td>
                  </tr>
                )),
              )}
            </tbody>
          </Table>
          <h2 className="mb-2 mt-6 text-lg font-semibold">What was done</h2>
          <ul className="list-disc pl-5 text-sm" data-testid="record-options">
            <li>Models: {rec.options.models.join(", ")}</li>
            {rec.options.window && <li>Window: {rec.options.window.from ?? "start"} – {rec.options.window.to ?? "end"} s</li>}
            {Object.entries(rec.options.fixed ?? {}).map(([k2, v]) => <li key={k2}>{k2} fixed at {v}</li>)}
            {(rec.options.exclusions ?? []).map((e) => <li key={e.index}>Point {e.index + 1} excluded: “{e.reason}”</li>)}
            {rec.options.conversion?.kind === "beer-lambert" && <li>Beer–Lambert: ε {rec.options.conversion.epsilon} L mol⁻¹ cm⁻¹, b {rec.options.conversion.pathLengthCm} cm</li>}
            {rec.options.conversion?.kind === "calibration" && (
              <li>
                Calibration {rec.options.conversion.calibrationId}: c = (A − {formatNumber(rec.options.conversion.intercept)}) / {formatNumber(rec.options.conversion.slope)} ({rec.options.conversion.unit})
              </li>
            )}
            {!rec.options.window && !rec.options.exclusions?.length && !rec.options.fixed && <li>Every point, nothing fixed.</li>}
          </ul>
        </section>
        <section className="min-w-0">
          <h2 className="mb-2 text-lg font-semibold">Versions</h2>
          <ol className="space-y-2" data-testid="versions">
            {versions.map((v) => (
              <li key={v.id} className={`rounded-cell border px-3 py-2 text-sm ${v.id === rec.id ? "border-quartz-600 bg-quartz-100" : "border-ink-100 bg-paper-raised"}`}>
                {outside ? <span className="font-semibold">Version {v.version}</span> : <Link href={`/fits/${v.id}`} className="font-semibold text-quartz-700 hover:underline">Version {v.version}</Link>}
                <span className="text-ink-500"> · {v.created_at.slice(0, 16).replace("T", " ")} UTC · {v.author ?? "—"} · k = {formatWithUncertainty(v.k, v.k_se)} {v.k_unit}</span>
                {v.reason && <p className="mt-1">Why: {v.reason}</p>}
                <ul className="mt-1 list-disc pl-5 text-ink-700">{v.changes.map((c) => <li key={c}>{c}</li>)}</ul>
              </li>
            ))}
          </ol>
        </section>
      </div>
      {!outside && (
      <section className="mt-8 min-w-0 break-words" aria-label="Audit events of this record">
        <h2 className="mb-2 text-lg font-semibold">Audit events of this record</h2>
        <ol className="space-y-1 text-sm" data-testid="record-audit">
          {audit.map((e) => (
            <li key={e.id}>
              <span className="num font-mono text-xs text-ink-500">{e.at.replace("T", " ").slice(0, 19)} UTC</span> {auditSentence(e)}
            </li>
          ))}
        </ol>
      </section>
      )}
    </>
  );
}

function MethodVerdict({ ev, linked }: { ev: NonNullable<FitRecordData["results"]["method_evaluation"]>; linked: boolean }) {
  return (
    <section className="mb-6 rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Method criteria" data-testid="record-criteria">
      <h2 className="text-lg font-semibold">
        Method criteria{" "}
        {ev.results.length === 0 ? <Badge tone="neutral">none set</Badge> : ev.passed ? <Badge tone="pass">all met</Badge> : <Badge tone="fault">{ev.failed} not met</Badge>}
      </h2>
      <p className="mt-1 text-sm text-ink-500">
        Judged at save by{" "}
        {linked ? <Link className="text-quartz-700 underline" href={`/methods/${ev.method.id}`}>{ev.method.name} v{ev.method.version}</Link> : `${ev.method.name} v${ev.method.version}`} on the {ev.model} fit.
      </p>
      {ev.results.length > 0 && (
        <div className="mt-3">
          <Table caption="Acceptance criteria of the method">
            <thead>
              <tr>
                <Th>Criterion</Th>
                <Th numeric>This fit</Th>
                <Th>Verdict</Th>
              </tr>
            </thead>
            <tbody>
              {ev.results.map((r) => (
                <tr key={r.kind} data-criterion={r.kind}>
                  <Td>{r.label}{r.note && <span className="block text-xs text-ink-500">{r.note}</span>}</Td>
                  <Td numeric>{r.observed ?? "—"}</Td>
                  <Td>{r.pass ? <Badge tone="pass">pass</Badge> : <Badge tone="fault">fail</Badge>}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </div>
      )}
    </section>
  );
}

/** Recomputed on every view: the content hash from the stored options and results, the data's and the raw file's SHA-256. */
function IntegrityNote({ integrity }: { integrity: RecordIntegrity }) {
  if (integrity.ok)
    return (
      <p className="mb-4 text-sm text-pass-700" data-testid="integrity" data-ok="true">
        Integrity verified: the content hash, the data&apos;s and the raw file&apos;s SHA-256 were recomputed from what is stored and match.
      </p>
    );
  return (
    <div role="alert" className="mb-4 rounded-cell bg-fault-100 px-4 py-3 text-sm text-fault-700" data-testid="integrity" data-ok="false">
      <p className="font-semibold">Tamper warning: this version no longer matches what was recorded. Do not rely on it; tell the lab administrator.</p>
      <ul className="mt-1 list-disc pl-5">
        {integrity.problems.map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
    </div>
  );
}
