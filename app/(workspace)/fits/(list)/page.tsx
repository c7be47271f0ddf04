import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { listFits } from "@/lib/fits";
import { formatWithUncertainty } from "@/lib/format/number";
import { fitListQuerySchema } from "@/lib/schemas/fits";

export const metadata: Metadata = { title: "Fits" };

const SORTS = [
  ["title", "Fit"],
  ["k_value", "k (s⁻¹)"],
  ["version", "Version"],
  ["created_at", "Saved"],
] as const;

export default async function FitsPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const user = await requirePageUser("fit:read", "/fits");
  const q = fitListQuerySchema.parse(await searchParams);
  const { fits, total } = await listFits(await getDb(), user.labId, q);
  const link = (patch: Record<string, string>) => `/fits?${new URLSearchParams({ sort: q.sort, dir: q.dir, ...(q.q ? { q: q.q } : {}), ...patch })}`;
  return (
    <>
      <PageHeader title="Fits" lede="Every fit record of the lab, newest version of each. Open one to see its versions, what changed and why." />
      <form className="mb-4 flex items-end gap-3" action="/fits">
        <label className="text-sm">
          <span className="block font-semibold text-ink-700">Search title or run</span>
          <input name="q" defaultValue={q.q} className="mt-1 h-9 w-64 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <button className="h-9 rounded-cell border border-ink-300 px-3 text-sm font-semibold">Filter</button>
        <span className="ml-auto text-sm text-ink-500">{total} record{total === 1 ? "" : "s"}</span>
      </form>
      {fits.length === 0 ? (
        <EmptyState title="No fits yet">Open a run, pick a channel and choose “Fit” to compare the linearized and nonlinear first-order fits and save a record.</EmptyState>
      ) : (
        <Table caption="Fit records">
          <thead>
            <tr>
              {SORTS.map(([key, label]) => (
                <Th key={key} numeric={key === "k_value" || key === "version"}>
                  <Link href={link({ sort: key, dir: q.sort === key && q.dir === "desc" ? "asc" : "desc" })} className="hover:text-quartz-700">
                    {label} {q.sort === key ? (q.dir === "asc" ? "▲" : "▼") : ""}
                  </Link>
                </Th>
              ))}
              <Th>Run · series</Th>
              <Th>Model</Th>
              <Th>Method criteria</Th>
              <Th>State</Th>
              <Th>Author</Th>
            </tr>
          </thead>
          <tbody>
            {fits.map((f) => (
              <tr key={f.id}>
                <Td><Link className="font-semibold text-quartz-700 hover:underline" href={`/fits/${f.id}`}>{f.title}</Link></Td>
                <Td numeric>{formatWithUncertainty(f.k_value, f.k_se)}</Td>
                <Td numeric data-testid="fit-version">v{f.version}</Td>
                <Td className="whitespace-nowrap">{String(f.created_at).slice(0, 16).replace("T", " ")} UTC</Td>
                <Td><Link className="hover:underline" href={`/runs/${f.run_id}`}>{f.run_name}</Link> · {f.series_name}{f.temperature_c != null ? ` · ${f.temperature_c} °C` : ""}</Td>
                <Td>{f.primary_model}</Td>
                <Td data-testid="fit-criteria">{f.criteria_failed === null ? <span className="text-ink-500">no method</span> : f.criteria_failed === 0 ? <Badge tone="pass">all met</Badge> : <Badge tone="fault">{f.criteria_failed} not met</Badge>}</Td>
                <Td><Badge tone={f.review_state === "approved" ? "pass" : f.review_state === "rejected" ? "fault" : f.review_state === "submitted" ? "accent" : "neutral"}>{f.review_state ?? "draft"}</Badge></Td>
                <Td>{f.author_name ?? "—"}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </>
  );
}
