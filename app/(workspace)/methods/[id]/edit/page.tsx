import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { MethodForm } from "@/components/methods/method-form";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { getMethod, listCalibrations } from "@/lib/methods";

export const metadata: Metadata = { title: "New method version" };

export default async function EditMethodPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("method:write", `/methods/${id}/edit`);
  const db = await getDb();
  const m = await getMethod(db, user.labId, Number(id)).catch(orNotFound);
  if (m.newest_id !== m.id) redirect(`/methods/${m.newest_id}/edit`);
  const cals = await listCalibrations(db, user.labId, { sort: "created_at", dir: "desc", page: 1, pageSize: 200 });
  return (
    <>
      <PageHeader title={`${m.name}: version ${m.version + 1}`} lede={`Changing version ${m.version}. Version ${m.version} stays as it is, and fits it judged keep its verdict.`} />
      <MethodForm initial={m.definition} versionOf={{ id: m.id, version: m.version }} calibrations={cals.rows.map((c) => ({ id: c.id, name: c.name, analyte: c.analyte }))} />
    </>
  );
}
