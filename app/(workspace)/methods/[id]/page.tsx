import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/shell/page-header";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { describeCriterion } from "@/lib/kinetics/criteria";
import { getMethod } from "@/lib/methods";
import { can } from "@/lib/permissions";
import { buttonLinkClass } from "@/components/ui/button";

export const metadata: Metadata = { title: "Method" };

export default async function MethodPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("method:read", `/methods/${id}`);
  const m = await getMethod(await getDb(), user.labId, Number(id)).catch(orNotFound);
  const d = m.definition;
  const newest = m.newest_id === m.id;
  return (
    <>
      <PageHeader
        title={m.name}
        lede={`Version ${m.version} of ${m.versions.length} · ${d.analyte} · saved ${m.created_at.slice(0, 16).replace("T", " ")} UTC by ${m.author ?? "—"}`}
        actions={
          can(user, "method:write") && newest ? (
            <Link href={`/methods/${m.id}/edit`} className={buttonLinkClass("secondary", "md", "text-sm")}>
              Change (new version)
            </Link>
          ) : undefined
        }
      />
      {!newest && (
        <p className="mb-4 rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700">
          This is not the newest version. <Link className="font-semibold underline" href={`/methods/${m.newest_id}`}>Open the newest</Link>; runs with this method are judged by it.
        </p>
      )}
      <div className="grid gap-6 lg:grid-cols-2">
        <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Method definition">
          <h2 className="mb-3 text-lg font-semibold">Measurement and fitting</h2>
          <dl className="grid grid-cols-[12rem_1fr] gap-y-1.5 text-sm">
            <dt className="text-ink-500">Wavelength</dt>
            <dd>{d.wavelength_nm ? `${d.wavelength_nm} nm` : "—"}</dd>
            <dt className="text-ink-500">Path length</dt>
            <dd>{d.path_length_cm} cm</dd>
            <dt className="text-ink-500">Concentration</dt>
            <dd>
              {d.concentration.kind === "none" ? "absorbance is fitted as measured" : d.concentration.kind === "beer-lambert" ? `Beer–Lambert, ε = ${d.concentration.epsilon} L mol⁻¹ cm⁻¹` : m.calibration ? (
                <>
                  calibration{" "}
                  <Link className="text-quartz-700 underline" href={`/methods/calibrations/${m.calibration.id}`}>
                    {m.calibration.name}
                  </Link>{" "}
                  (slope {formatWithUncertainty(m.calibration.results.slope, m.calibration.results.se_slope)} AU per {m.calibration.concentration_unit}; LOQ {formatNumber(m.calibration.results.loq, 3)} {m.calibration.concentration_unit})
                </>
              ) : "calibration (missing)"}
            </dd>
            <dt className="text-ink-500">Blank</dt>
            <dd>{d.blank.kind === "none" ? "no correction" : d.blank.kind === "channel" ? "a blank channel, subtracted at upload" : `fixed blank ${d.blank.value} AU`}</dd>
            <dt className="text-ink-500">Models</dt>
            <dd>{d.models.join(", ")} (criteria judge {d.models[0]})</dd>
            <dt className="text-ink-500">Weighting</dt>
            <dd>{d.weighting === "log" ? "linearized fit weighted by (y − A∞)²" : "none"}</dd>
            <dt className="text-ink-500">Window</dt>
            <dd>{d.window.from_s == null && d.window.to_s == null ? "all readings" : `${d.window.from_s ?? "start"} s to ${d.window.to_s ?? "end"} s`}</dd>
          </dl>
          {d.custom_models.length > 0 && (
            <>
              <h3 className="mt-4 text-sm font-semibold">Custom models</h3>
              <ul className="mt-1 space-y-1 text-sm">
                {d.custom_models.map((c) => (
                  <li key={c.name}>
                    <span className="font-semibold">{c.name}</span>: <code className="font-mono">{c.formula}</code>
                  </li>
                ))}
              </ul>
            </>
          )}
          {d.notes && <p className="mt-4 whitespace-pre-wrap text-sm text-ink-700">{d.notes}</p>}
        </section>
        <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Acceptance criteria">
          <h2 className="mb-3 text-lg font-semibold">Acceptance criteria</h2>
          {d.criteria.length === 0 ? (
            <p className="text-sm text-ink-500">None: fits of runs with this method are not judged.</p>
          ) : (
            <ul className="list-disc space-y-1 pl-5 text-sm" data-testid="method-criteria">
              {d.criteria.map((c) => (
                <li key={c.kind}>{describeCriterion(c)}</li>
              ))}
            </ul>
          )}
          <p className="mt-4 text-xs text-ink-500">Passing these criteria shows a fit was made as the method says; release and shelf-life decisions remain with qualified review under your lab&apos;s SOPs and local regulations.</p>
        </section>
      </div>
      <h2 className="mb-2 mt-8 text-lg font-semibold">Versions</h2>
      <Table caption="Method versions">
        <thead>
          <tr>
            <Th numeric>Version</Th>
            <Th>Saved</Th>
            <Th>By</Th>
            <Th>Why</Th>
          </tr>
        </thead>
        <tbody>
          {m.versions.map((v) => (
            <tr key={v.id}>
              <Td numeric>
                <Link className="text-quartz-700 underline" href={`/methods/${v.id}`}>
                  {v.version}
                </Link>
              </Td>
              <Td>{v.created_at.slice(0, 16).replace("T", " ")} UTC</Td>
              <Td>{v.author ?? "—"}</Td>
              <Td>{v.reason ?? (v.version === 1 ? "created" : "—")}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </>
  );
}
