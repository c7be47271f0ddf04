import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { RunMethod } from "@/components/runs/run-method";
import { RunChannelsPlot } from "@/components/runs/run-plot";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { solutionColour } from "@/lib/colour/wavelength";
import { formatBytes, formatSeconds } from "@/lib/format/number";
import { methodChoices } from "@/lib/methods";
import { can } from "@/lib/permissions";
import { getRunDetail } from "@/lib/runs";
import { buttonLinkClass } from "@/components/ui/button";

export const metadata: Metadata = { title: "Run" };

export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("run:read", `/runs/${id}`);
  const runId = Number(id);
  if (!Number.isInteger(runId) || runId <= 0) notFound();
  const db = await getDb();
  const run = await getRunDetail(db, user.labId, runId).catch(orNotFound);
  const colour = solutionColour(run.wavelength_nm);
  const facts: Array<[string, string | number | null]> = [
    ["Wavelength", run.wavelength_nm != null ? `${run.wavelength_nm} nm` : null],
    ["Path length", run.path_length_cm != null ? `${run.path_length_cm} cm` : null],
    ["Temperature", run.temperature_c != null ? `${run.temperature_c} °C` : null],
    ["Study", run.study],
    ["Sample", run.sample],
    ["Cell", run.cell],
    ["Operator", run.operator],
    ["Dilution factor", run.dilution_factor],
  ];
  return (
    <>
      <PageHeader
        title={run.name}
        lede={`Read by the ${run.parser} parser from ${run.raw_file.name}; uploaded ${run.created_at.slice(0, 16).replace("T", " ")} UTC${run.created_by ? ` by ${run.created_by}` : ""}.`}
        actions={
          <a href={`/api/raw-files/${run.raw_file.id}`} className={buttonLinkClass("secondary", "md", "text-sm")}>
            Download the original file
          </a>
        }
      />
      <section className="mb-8 rounded-cell bg-paper-raised p-4 shadow-lift">
        <RunChannelsPlot runId={run.id} series={run.series.map((s) => ({ id: s.id, name: s.name, unit: s.unit, quantity: s.quantity }))} wavelength={run.wavelength_nm} />
        {colour.seen && (
          <p className="mt-2 text-xs text-ink-500">
            <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full align-middle" style={{ background: colour.hex }} aria-hidden="true" />
            Drawn in the colour the solution shows: absorbing at {run.wavelength_nm} nm, it looks {colour.seen}.
          </p>
        )}
      </section>
      {run.warnings.length > 0 && (
        <section className="mb-6 rounded-cell border-l-4 border-caution-700 bg-caution-100 px-4 py-3 text-sm text-caution-700" aria-label="Warnings from reading the file">
          <p className="font-semibold">Read with {run.warnings.length} note{run.warnings.length > 1 ? "s" : ""}</p>
          <ul className="mt-1 list-disc pl-5">{run.warnings.map((w) => <li key={w}>{w}</li>)}</ul>
        </section>
      )}
      <div className="grid gap-8 lg:grid-cols-2">
        <section>
          <h2 className="mb-3 text-lg font-semibold">Channels</h2>
          <Table caption="Channels of this run">
            <thead>
              <tr>
                <Th>Channel</Th>
                <Th>Quantity</Th>
                <Th numeric>Points</Th>
                <Th>Time span</Th>
                <Th>Skipped lines</Th>
              </tr>
            </thead>
            <tbody>
              {run.series.map((s) => (
                <tr key={s.id}>
                  <Td className="font-semibold">
                    {s.name}{" "}
                    <Link href={`/runs/${run.id}/series/${s.id}/fit`} className="ml-2 text-sm font-semibold text-quartz-700 underline" data-testid="fit-link">
                      Fit
                    </Link>
                  </Td>
                  <Td>
                    {s.quantity} ({s.unit})
                    {typeof s.processing.converted === "string" && <Badge tone="accent">from %T</Badge>}
                    {typeof s.processing.blank_subtracted === "string" && <Badge tone="accent">blank {s.processing.blank_subtracted} subtracted</Badge>}
                  </Td>
                  <Td numeric>{s.points.toLocaleString("en")}</Td>
                  <Td>{s.t_range ? `${formatSeconds(s.t_range[0])} – ${formatSeconds(s.t_range[1])}` : "—"}</Td>
                  <Td>{s.skipped_lines.length ? <span title={s.skipped_lines.join(", ")}>{s.skipped_lines.length} (lines {s.skipped_lines.slice(0, 5).join(", ")}{s.skipped_lines.length > 5 ? ", …" : ""})</span> : "none"}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </section>
        <section>
          <h2 className="mb-3 text-lg font-semibold">Run details</h2>
          <dl className="grid grid-cols-[10rem_1fr] gap-x-4 gap-y-1.5 text-sm">
            {facts.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-500">{k}</dt>
                <dd>{v ?? <span className="text-ink-500">not given</span>}</dd>
              </div>
            ))}
            <dt className="text-ink-500">Method</dt>
            <dd>
              <RunMethod runId={run.id} runWavelength={run.wavelength_nm} current={run.method_record_id ? { record_id: run.method_record_id, name: run.method ?? "method" } : null} choices={can(user, "run:upload") ? await methodChoices(db, user.labId) : []} canAssign={can(user, "run:upload")} />
              {!run.method_record_id && run.method && <span className="block text-xs text-ink-500">The file names “{run.method}”, which is not one of the lab&apos;s methods.</span>}
            </dd>
            <dt className="text-ink-500">Original file</dt>
            <dd>
              {run.raw_file.name} · {formatBytes(run.raw_file.size ?? 0)}
              <span className="block break-all font-mono text-xs text-ink-500">SHA-256 {run.raw_file.sha256}</span>
            </dd>
          </dl>
          <details className="mt-4 text-sm">
            <summary className="cursor-pointer font-semibold text-quartz-700">Metadata as found in the file</summary>
            <dl className="mt-2 grid grid-cols-[10rem_1fr] gap-x-4 gap-y-1">
              {Object.entries(run.metadata).map(([k, v]) => (
                <div key={k} className="contents">
                  <dt className="truncate text-ink-500" title={k}>{k}</dt>
                  <dd className="whitespace-pre-wrap break-words">{String(v)}</dd>
                </div>
              ))}
            </dl>
          </details>
        </section>
      </div>
    </>
  );
}
