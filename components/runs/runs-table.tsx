"use client";
// The runs list: sortable, filterable, paged, read through SWR from GET /api/runs.
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { solutionColour } from "@/lib/colour/wavelength";
import { fetcher } from "@/lib/http/fetcher";
import type { RunSummary } from "@/lib/schemas/runs";

type Sort = "created_at" | "name" | "wavelength_nm" | "temperature_c" | "study";
interface ListResponse {
  runs: RunSummary[];
  total: number;
  page: number;
  pageSize: number;
}

const COLUMNS: Array<{ key: Sort | null; label: string; numeric?: boolean }> = [
  { key: "name", label: "Run" },
  { key: "study", label: "Study" },
  { key: "wavelength_nm", label: "λ (nm)", numeric: true },
  { key: "temperature_c", label: "T (°C)", numeric: true },
  { key: null, label: "Channels", numeric: true },
  { key: null, label: "File" },
  { key: "created_at", label: "Uploaded" },
];

export function RunsTable({ canUpload }: { canUpload: boolean }) {
  const [sort, setSort] = useState<Sort>("created_at");
  const [dir, setDir] = useState<"asc" | "desc">("desc");
  const [page, setPage] = useState(1);
  const [q, setQ] = useState("");
  const [study, setStudy] = useState("");
  const params = new URLSearchParams({ sort, dir, page: String(page), pageSize: "20" });
  if (q) params.set("q", q);
  if (study) params.set("study", study);
  const { data, error, isLoading } = useSWR<ListResponse>(`/api/runs?${params}`, fetcher, { keepPreviousData: true });

  const toggle = (key: Sort) => {
    if (key === sort) setDir(dir === "asc" ? "desc" : "asc");
    else {
      setSort(key);
      setDir(key === "created_at" ? "desc" : "asc");
    }
    setPage(1);
  };
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  return (
    <section aria-label="Runs">
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <label className="text-sm">
          <span className="block font-semibold text-ink-700">Search name or sample</span>
          <input value={q} onChange={(e) => { setQ(e.target.value); setPage(1); }} className="mt-1 h-9 w-64 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <label className="text-sm">
          <span className="block font-semibold text-ink-700">Study</span>
          <input value={study} onChange={(e) => { setStudy(e.target.value); setPage(1); }} className="mt-1 h-9 w-48 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        {data && <p className="ml-auto text-sm text-ink-500" aria-live="polite">{data.total} run{data.total === 1 ? "" : "s"}</p>}
      </div>
      {error ? (
        <p role="alert" className="rounded-cell bg-fault-100 px-4 py-3 text-fault-700">The runs could not be loaded: {error.message}</p>
      ) : isLoading && !data ? (
        <div className="space-y-2" aria-label="Loading runs">{Array.from({ length: 5 }, (_, i) => <div key={i} className="h-10 animate-pulse rounded-cell bg-paper-sunk" />)}</div>
      ) : data && data.total === 0 && !q && !study ? (
        <EmptyState
          title="No runs yet"
          action={canUpload ? <Link href="/runs/new" className="font-semibold text-quartz-700 underline">Upload your first export</Link> : undefined}
        >
          Runs appear here once an analyst uploads a spectrophotometer export (CSV, text or JCAMP-DX).
        </EmptyState>
      ) : (
        <>
          <Table caption="Runs in this lab">
            <thead>
              <tr>
                {COLUMNS.map((c) => (
                  <Th key={c.label} numeric={c.numeric} aria-sort={c.key === sort ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                    {c.key ? (
                      <button type="button" onClick={() => toggle(c.key!)} className="inline-flex items-center gap-1 hover:text-quartz-700">
                        {c.label}
                        <span aria-hidden="true">{c.key === sort ? (dir === "asc" ? "▲" : "▼") : ""}</span>
                      </button>
                    ) : (
                      c.label
                    )}
                  </Th>
                ))}
              </tr>
            </thead>
            <tbody>
              {data?.runs.map((r) => {
                const colour = solutionColour(r.wavelength_nm);
                return (
                  <tr key={r.id} className="hover:bg-paper">
                    <Td>
                      <Link href={`/runs/${r.id}`} className="inline-flex items-center gap-2 font-semibold text-quartz-700 hover:underline">
                        <span className="inline-block h-3 w-3 rounded-full border border-ink-300" style={{ background: colour.hex }} title={colour.seen ? `solution looks ${colour.seen}` : "no visible colour"} aria-hidden="true" />
                        {r.name}
                      </Link>
                      {r.sample && <span className="ml-2 text-ink-500">{r.sample}</span>}
                    </Td>
                    <Td>{r.study ?? <span className="text-ink-500">—</span>}</Td>
                    <Td numeric>{r.wavelength_nm ?? "—"}</Td>
                    <Td numeric>{r.temperature_c ?? "—"}</Td>
                    <Td numeric>{r.series_count}</Td>
                    <Td>
                      <span className="font-mono text-xs" title={`SHA-256 ${r.raw_file.sha256}`}>{r.raw_file.name}</span>
                      <Badge tone="neutral">{r.parser}</Badge>
                    </Td>
                    <Td className="whitespace-nowrap">{r.created_at.slice(0, 16).replace("T", " ")} UTC{r.created_by ? ` · ${r.created_by}` : ""}</Td>
                  </tr>
                );
              })}
            </tbody>
          </Table>
          {data && data.runs.length === 0 && <p className="mt-3 text-ink-500">No run matches these filters.</p>}
          <nav aria-label="Pages" className="mt-4 flex items-center gap-3 text-sm">
            <button type="button" disabled={page <= 1} onClick={() => setPage(page - 1)} className="rounded-cell border border-ink-300 px-3 py-1 disabled:opacity-40">Previous</button>
            <span>Page {page} of {pages}</span>
            <button type="button" disabled={page >= pages} onClick={() => setPage(page + 1)} className="rounded-cell border border-ink-300 px-3 py-1 disabled:opacity-40">Next</button>
          </nav>
        </>
      )}
    </section>
  );
}
