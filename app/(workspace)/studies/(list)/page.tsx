import type { Metadata } from "next";
import Link from "next/link";
import { NewStudyForm } from "@/components/studies/new-study-form";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { listFits } from "@/lib/fits";
import { formatWithUncertainty } from "@/lib/format/number";
import { can } from "@/lib/permissions";
import { listStudies } from "@/lib/studies";

export const metadata: Metadata = { title: "Temperature studies" };

export default async function StudiesPage() {
  const user = await requirePageUser("study:read", "/studies");
  const db = await getDb();
  const studies = await listStudies(db, user.labId);
  const fits = can(user, "study:write") ? (await listFits(db, user.labId, { sort: "created_at", dir: "desc", page: 1, pageSize: 200 })).fits : [];
  return (
    <>
      <PageHeader
        title="Temperature studies"
        lede="Rate constants from saved fits at several temperatures give the activation energy and the Eyring parameters with their uncertainties, and predictions at a storage temperature."
      />
      {studies.length === 0 ? (
        <EmptyState title="No studies yet">Pick saved fits of runs at three or more temperatures below to make the first one.</EmptyState>
      ) : (
        <Table caption="Studies">
          <thead>
            <tr>
              <Th>Study</Th>
              <Th>Kind</Th>
              <Th numeric>Members</Th>
              <Th numeric>Result</Th>
              <Th numeric>Version</Th>
              <Th>Saved</Th>
            </tr>
          </thead>
          <tbody>
            {studies.map((s) => (
              <tr key={s.id}>
                <Td>
                  <Link href={`/studies/${s.id}`} className="font-semibold text-quartz-700 hover:underline">
                    {s.name}
                  </Link>
                </Td>
                <Td>{s.kind === "temperature" ? "across temperatures" : "across excess concentrations"}</Td>
                <Td numeric>{s.members}</Td>
                <Td numeric>
                  {s.ea ? `Ea ${formatWithUncertainty(s.ea.value / 1000, s.ea.se === null ? null : s.ea.se / 1000)} kJ mol⁻¹` : s.k2 ? `k2 ${formatWithUncertainty(s.k2.value, s.k2.se)} L mol⁻¹ s⁻¹` : "—"}
                </Td>
                <Td numeric>v{s.version}</Td>
                <Td>
                  {s.created_at.slice(0, 16).replace("T", " ")} UTC · {s.author ?? "—"}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      {can(user, "study:write") && (
        <section className="mt-8">
          <h2 className="mb-3 text-lg font-semibold">New study</h2>
          <NewStudyForm
            fits={fits.map((f) => ({ id: f.id, title: f.title, version: f.version, k: f.k_value, se: f.k_se, temperature_c: f.temperature_c, run_name: f.run_name }))}
          />
        </section>
      )}
    </>
  );
}
