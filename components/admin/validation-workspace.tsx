"use client";
// Run the validation, watch it run, read every case, sign the report, download it as PDF or JSON.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/badge";
import { Button, buttonLinkClass } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { Table, Td, Th } from "@/components/ui/table";
import { useToast } from "@/components/ui/toast";
import { fetcher } from "@/lib/http/fetcher";
import type { JobView } from "@/lib/jobs/background";
import type { ValidationRecord } from "@/lib/validation/records";
import { problemText, sendJson } from "@/lib/http/client";
import { useWatch } from "react-hook-form";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { submitSchema } from "@/lib/schemas/reviews";

interface RunRow {
  id: number;
  all_passed: boolean;
  passed: number;
  failed: number;
  engine_version: string;
  run_at: string;
  run_by_name: string;
}

export function ValidationWorkspace({ runs, record, active }: { runs: RunRow[]; record: ValidationRecord | null; active: JobView | null }) {
  const router = useRouter();
  const toast = useToast();
  const [jobId, setJobId] = useState<number | null>(active?.id ?? null);
  const [starting, setStarting] = useState(false);
  const [onlyFailed, setOnlyFailed] = useState(false);
  // The queued run is watched until it ends (its row holds the progress the server writes as it goes).
  const { data } = useSWR<{ job: JobView }>(jobId ? `/api/jobs/${jobId}` : null, fetcher, {
    refreshInterval: (d) => (d && (d.job.state === "done" || d.job.state === "failed") ? 0 : 250),
    // SWR folds requests within its deduping interval (2 s by default) into one, polls included: a run shorter than
    // that would show no progress at all.
    dedupingInterval: 0,
    onSuccess: ({ job: j }) => {
      if (j.state === "done") {
        const out = j.result as { id: number; passed: number; failed: number; all_passed: boolean; seconds: number };
        toast(`${out.passed} passed, ${out.failed} failed in ${out.seconds.toFixed(1)} s.`, out.all_passed ? "pass" : "fault");
        setJobId(null);
        router.push(`/admin/validation?run=${out.id}`);
        router.refresh();
      } else if (j.state === "failed") {
        toast(`The validation run stopped: ${j.error ?? "no reason was given"}`, "fault");
        setJobId(null);
      }
    },
    onError: (e: Error) => toast(`Lost track of the validation run: ${e.message}`, "fault"),
  });
  const job = data?.job ?? (active && active.id === jobId ? active : null);
  const running = starting || (jobId !== null && (!job || job.state === "queued" || job.state === "running"));

  async function run() {
    setStarting(true);
    try {
      const out = await sendJson<{ job: JobView }>("/api/validation");
      setJobId(out.job.id);
    } catch (e) {
      toast(problemText(e), "fault");
    } finally {
      setStarting(false);
    }
  }

  const cases = record ? record.report.cases.filter((c) => !onlyFailed || !c.pass) : [];
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center gap-4">
        <Button onClick={run} disabled={running} data-testid="run-validation">
          {running ? "Running…" : "Run the validation now"}
        </Button>
        {running && (
          <div
            className="w-80 max-w-full"
            role="progressbar"
            aria-label="Validation running"
            aria-busy="true"
            aria-valuemin={0}
            aria-valuemax={job?.progress.total || undefined}
            aria-valuenow={job?.progress.total ? job.progress.done : undefined}
            data-testid="validation-progress"
          >
            <div className="h-2 w-full overflow-hidden rounded-full bg-ink-100">
              {job?.progress.total ? (
                <div className="h-full bg-quartz-600 transition-[width]" style={{ width: `${Math.round((100 * job.progress.done) / job.progress.total)}%` }} />
              ) : (
                <div className="h-full w-1/3 animate-pulse bg-quartz-600" />
              )}
            </div>
            <p className="mt-1 text-xs text-ink-500" data-testid="validation-progress-text">
              {!job || job.state === "queued"
                ? "Queued; a server process will take it in a moment…"
                : job.progress.total
                  ? `Reference problem ${job.progress.done} of ${job.progress.total}${job.progress.note ? ` (${job.progress.note})` : ""}`
                  : "Starting…"}
            </p>
          </div>
        )}
      </div>
      {runs.length > 0 && (
        <section>
          <h2 className="mb-2 text-lg font-semibold">Past runs</h2>
          <ul className="flex flex-wrap gap-2 text-sm">
            {runs.map((r) => (
              <li key={r.id}>
                <Link href={`/admin/validation?run=${r.id}`} className={`inline-flex items-center gap-2 rounded-cell border px-3 py-1 ${record?.id === r.id ? "border-quartz-600 bg-quartz-100" : "border-ink-300"}`}>
                  Run {r.id} · {r.run_at.slice(0, 16).replace("T", " ")} UTC <Badge tone={r.all_passed ? "pass" : "fault"}>{r.all_passed ? "all passed" : `${r.failed} failed`}</Badge>
                </Link>
              </li>
            ))}
          </ul>
        </section>
      )}
      {record && (
        <section className="space-y-4" aria-label={`Validation run ${record.id}`}>
          <div className="rounded-cell bg-paper-raised p-5 shadow-lift">
            <p className="text-lg font-semibold" data-testid="validation-summary">
              Run {record.id}: {record.report.passed} passed, {record.report.failed} failed <Badge tone={record.report.all_passed ? "pass" : "fault"}>{record.report.all_passed ? "PASS" : "FAIL"}</Badge>
            </p>
            <p className="text-sm text-ink-500">
              {record.report.engine_version} · Node {record.report.node} · {record.report.platform} · {record.report.started_at.replace("T", " ").slice(0, 19)} UTC · {record.run_by} · {record.report.seconds.toFixed(1)} s
            </p>
            <p className="break-all font-mono text-xs text-ink-500">report content hash {record.content_hash}</p>
            <div className="mt-3 flex flex-wrap items-end gap-3">
              <a className={buttonLinkClass("secondary", "md", "text-sm")} href={`/api/validation/${record.id}/report`} data-testid="validation-pdf">
                PDF report
              </a>
              <a className={buttonLinkClass("secondary", "md", "text-sm")} href={`/api/validation/${record.id}/report?format=json`}>
                JSON
              </a>
              {record.signatures.length === 0 ? (
                <SignReport recordId={record.id} />
              ) : (
                record.signatures.map((s) => (
                  <p key={s.signed_at} className="text-sm">
                    Signed by <strong>{s.printed_name}</strong> ({s.meaning}) {s.signed_at.replace("T", " ").slice(0, 19)} UTC{s.void ? " · VOID" : ""}
                  </p>
                ))
              )}
            </div>
          </div>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={onlyFailed} onChange={(e) => setOnlyFailed(e.target.checked)} /> Show failed cases only
          </label>
          <Table caption="Validation cases">
            <thead>
              <tr>
                <Th>Result</Th>
                <Th>Case</Th>
                <Th numeric>Ours</Th>
                <Th numeric>Reference</Th>
                <Th numeric>LRE</Th>
                <Th>Threshold</Th>
                <Th>Source</Th>
              </tr>
            </thead>
            <tbody data-testid="validation-cases">
              {cases.map((c) => (
                <tr key={c.id}>
                  <Td>
                    <Badge tone={c.pass ? "pass" : "fault"}>{c.pass ? "pass" : "FAIL"}</Badge>
                  </Td>
                  <Td className="font-mono text-xs">{c.id}</Td>
                  <Td numeric>{c.ours === null ? "—" : c.ours.toPrecision(10)}</Td>
                  <Td numeric>{c.reference}</Td>
                  <Td numeric>{c.lre === null ? "—" : c.lre.toFixed(1)}</Td>
                  <Td className="text-xs">{c.threshold}</Td>
                  <Td className="text-xs text-ink-500">{c.source}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </section>
      )}
    </div>
  );
}

/** Signing the report with the password (the route's own schema checks the form first). */
function SignReport({ recordId }: { recordId: number }) {
  const router = useRouter();
  const toast = useToast();
  const { register, handleSubmit, control, reset, formState } = useSchemaForm<{ password: string }, typeof submitSchema>((v) => v, submitSchema, { password: "" });
  const password = useWatch({ control, name: "password" });
  const sign = handleSubmit(async (body) => {
    try {
      await sendJson(`/api/validation/${recordId}/sign`, { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    reset({ password: "" });
    toast("Report signed.", "pass");
    router.refresh();
  });
  return (
    <form className="flex items-end gap-2" onSubmit={sign} noValidate>
      <div className="w-56">
        <Input label="Your password, to sign" type="password" autoComplete="current-password" {...register("password")} error={fieldError(formState.errors, "password")} />
      </div>
      <Button type="submit" variant="secondary" disabled={!password || formState.isSubmitting}>
        Sign the report
      </Button>
    </form>
  );
}
