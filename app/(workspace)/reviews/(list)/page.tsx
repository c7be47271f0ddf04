import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { formatWithUncertainty } from "@/lib/format/number";
import { reviewQueue } from "@/lib/reviews";

export const metadata: Metadata = { title: "Review queue" };

export default async function ReviewQueuePage() {
  const user = await requirePageUser("review:read", "/reviews");
  const queue = await reviewQueue(await getDb(), user.labId);
  return (
    <>
      <PageHeader title="Review queue" lede="Record versions submitted for review, oldest first. You never review your own work." />
      {queue.length === 0 ? (
        <EmptyState title="Nothing is waiting">Submitted fits and studies appear here until a reviewer approves or rejects them.</EmptyState>
      ) : (
        <>
        {/* At phone width: one card per record (no sideways scrolling); from sm up: the table. */}
        <ul className="space-y-3 sm:hidden" aria-label="Records awaiting review">
          {queue.map((q) => (
            <li key={`${q.object_type}-${q.id}`} className="rounded-cell bg-paper-raised p-4 shadow-lift">
              <p className="text-xs uppercase tracking-wide text-ink-500">{q.object_type === "fit" ? "fit" : "study"}</p>
              <Link className="font-semibold text-quartz-700 hover:underline" href={`/${q.object_type === "fit" ? "fits" : "studies"}/${q.id}`}>
                {q.title}
              </Link>{" "}
              v{q.version}
              <p className="mt-1 text-sm text-ink-700">
                {q.run_name}
                {q.k_value === null ? "" : ` · k ${formatWithUncertainty(q.k_value, q.k_se)} s⁻¹`}
              </p>
              <p className="text-sm text-ink-700">
                {q.submitted_by}, {String(q.submitted_at).slice(0, 16).replace("T", " ")} UTC · waiting {q.age_hours < 48 ? `${q.age_hours.toFixed(1)} h` : `${(q.age_hours / 24).toFixed(1)} d`}
              </p>
              {q.author_id === user.userId && <p className="text-xs text-ink-500">Yours: someone else must review it.</p>}
            </li>
          ))}
        </ul>
        <div className="hidden sm:block">
        <Table caption="Records awaiting review">
          <thead>
            <tr>
              <Th>Record</Th>
              <Th>Run or members</Th>
              <Th numeric>k (s⁻¹)</Th>
              <Th>Submitted by</Th>
              <Th numeric>Waiting</Th>
            </tr>
          </thead>
          <tbody>
            {queue.map((q) => (
              <tr key={`${q.object_type}-${q.id}`}>
                <Td>
                  <span className="mr-2 text-xs uppercase tracking-wide text-ink-500">{q.object_type === "fit" ? "fit" : "study"}</span>
                  <Link className="font-semibold text-quartz-700 hover:underline" href={`/${q.object_type === "fit" ? "fits" : "studies"}/${q.id}`}>
                    {q.title}
                  </Link>{" "}
                  v{q.version}
                  {q.author_id === user.userId && <span className="ml-2 text-xs text-ink-500">(yours: someone else must review it)</span>}
                </Td>
                <Td>{q.run_name}</Td>
                <Td numeric>{q.k_value === null ? "—" : formatWithUncertainty(q.k_value, q.k_se)}</Td>
                <Td>
                  {q.submitted_by}, {String(q.submitted_at).slice(0, 16).replace("T", " ")} UTC
                </Td>
                <Td numeric>{q.age_hours < 48 ? `${q.age_hours.toFixed(1)} h` : `${(q.age_hours / 24).toFixed(1)} d`}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
        </div>
        </>
      )}
    </>
  );
}
