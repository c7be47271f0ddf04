import type { Metadata } from "next";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { listAuditTrail } from "@/lib/audit";
import { requirePageUser } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Audit trail" };

export default async function AuditPage() {
  const user = await requirePageUser("audit:read", "/admin/audit");
  const events = await listAuditTrail(await getDb(), user.labId, { limit: 200 });
  return (
    <>
      <PageHeader
        title="Audit trail"
        lede="Append-only and hash-chained: rows are never changed or removed. Times are the server clock, in UTC."
      />
      {events.length === 0 ? (
        <EmptyState title="No events yet">Sign-ins, changes and signatures in this lab will be listed here.</EmptyState>
      ) : (
        <Table caption="Audit events, newest first">
          <thead>
            <tr>
              <Th>When (UTC)</Th>
              <Th>Who</Th>
              <Th>What</Th>
              <Th>Object</Th>
              <Th>Why</Th>
            </tr>
          </thead>
          <tbody>
            {events.map((e) => (
              <tr key={e.id}>
                <Td className="num whitespace-nowrap font-mono">
                  {e.at.replace("T", " ").slice(0, 19)}
                </Td>
                <Td>{e.actorLabel ?? (e.actorUserId ? `user #${e.actorUserId}` : "—")}</Td>
                <Td className="font-mono text-xs">{e.action}</Td>
                <Td>{e.objectType ? `${e.objectType} ${e.objectId ?? ""}${e.objectVersion ? ` v${e.objectVersion}` : ""}` : "—"}</Td>
                <Td>{e.reason ?? "—"}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </>
  );
}
