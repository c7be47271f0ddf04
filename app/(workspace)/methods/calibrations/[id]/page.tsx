import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { CalibrationWorkbench } from "@/components/methods/calibration-workbench";
import { MethodsNav } from "@/components/methods/methods-nav";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { getCalibration } from "@/lib/methods";

export const metadata: Metadata = { title: "Calibration curve" };

export default async function CalibrationPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("method:read", `/methods/calibrations/${id}`);
  const c = await getCalibration(await getDb(), user.labId, Number(id)).catch(orNotFound);
  return (
    <>
      <PageHeader title={c.name} lede={`${c.analyte} · saved ${c.created_at.slice(0, 16).replace("T", " ")} UTC by ${c.author ?? "—"} · engine ${c.engine_version} · content hash ${c.content_hash.slice(0, 12)}…`} />
      <MethodsNav current="calibrations" />
      <CalibrationWorkbench saved={c} canSave={false} />
    </>
  );
}
