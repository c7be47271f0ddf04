import type { Metadata } from "next";
import { MethodForm } from "@/components/methods/method-form";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { listCalibrations } from "@/lib/methods";

export const metadata: Metadata = { title: "New method" };

export default async function NewMethodPage() {
  const user = await requirePageUser("method:write", "/methods/new");
  const cals = await listCalibrations(await getDb(), user.labId, { sort: "created_at", dir: "desc", page: 1, pageSize: 200 });
  return (
    <>
      <PageHeader title="New method" lede="Write down how runs of this kind are evaluated. Every later change is a new version with a reason; fits keep the version that judged them." />
      <MethodForm calibrations={cals.rows.map((c) => ({ id: c.id, name: c.name, analyte: c.analyte }))} />
    </>
  );
}
