import type { Metadata } from "next";
import { IntegrityCheck } from "@/components/admin/integrity-check";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { listAuditTrail } from "@/lib/audit";
import { auditSentence } from "@/lib/audit/sentences";
import { requirePageUser } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Audit trail" };

export default async function AuditPage({ searchParams }: { searchParams: Promise<{ action?: string; from?: string; to?: string; objectType?: string; objectId?: string }> }) {
  const user = await requirePageUser("audit:read", "/admin/audit");
  const f = await searchParams;
  const objectType = f.objectType && ["fit", "study", "method", "run", "calibration", "user"].includes(f.objectType) ? f.objectType : undefined;
  const objectId = objectType && f.objectId && /^\d{1,12}$/.test(f.objectId) ? f.objectId : undefined;
  const events = await listAuditTrail(await getDb(), user.labId, { limit: 200, action: f.action || undefined, from: f.from || undefined, to: f.to || undefined, objectType, objectId });
  const csv = `/api/audit?${new URLSearchParams({ format: "csv", limit: "500", ...(f.action ? { action: f.action } : {}), ...(f.from ? { from: f.from } : {}), ...(f.to ? { to: f.to } : {}) })}`;
  return (
    <>
      <PageHeader
        title="Audit trail"
        lede="Append-only, hash-chained and keyed: rows are never changed or removed. Times are the server clock, in UTC; the CSV export keeps every field and code."
      />
      <IntegrityCheck />
      <form className="mb-4 flex flex-wrap items-end gap-3 text-sm" action="/admin/audit">
        <label>
          <span className="block font-semibold text-ink-700">Action starts with</span>
          <input name="action" defaultValue={f.action} placeholder="fit." className="mt-1 h-9 w-48 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <label>
          <span className="block font-semibold text-ink-700">From (UTC)</span>
          <input name="from" defaultValue={f.from} placeholder="2026-12-01" className="mt-1 h-9 w-36 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <label>
          <span className="block font-semibold text-ink-700">To (UTC)</span>
          <input name="to" defaultValue={f.to} placeholder="2026-12-31" className="mt-1 h-9 w-36 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <label>
          <span className="block font-semibold text-ink-700">Record</span>
          <select name="objectType" defaultValue={objectType ?? ""} className="mt-1 h-9 rounded-cell border border-ink-300 bg-paper-raised px-2">
            <option value="">any</option>
            <option value="fit">fit record</option>
            <option value="study">study</option>
            <option value="method">method</option>
            <option value="run">run</option>
            <option value="calibration">calibration</option>
            <option value="user">member</option>
          </select>
        </label>
        <label>
          <span className="block font-semibold text-ink-700">Number</span>
          <input name="objectId" defaultValue={objectId} placeholder="12" inputMode="numeric" className="mt-1 h-9 w-20 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <button className="h-9 rounded-cell border border-ink-300 px-3 font-semibold">Filter</button>
        <a href={csv} className="ml-auto font-semibold text-quartz-700 underline">Export CSV</a>
      </form>
      {events.length === 0 ? (
        <EmptyState title="No events yet">Sign-ins, changes and signatures in this lab will be listed here.</EmptyState>
      ) : (
        <Table caption="Audit events, newest first">
          <thead>
            <tr>
              <Th>When (UTC)</Th>
              <Th>What happened</Th>
            </tr>
          </thead>
          <tbody>
            {events.map((e) => (
              <tr key={e.id}>
                <Td className="num whitespace-nowrap font-mono">
                  {e.at.replace("T", " ").slice(0, 19)}
                </Td>
                <Td>
                  {auditSentence(e)} <span className="font-mono text-xs text-ink-500">{e.action}</span>
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </>
  );
}
