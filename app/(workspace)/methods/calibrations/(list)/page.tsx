import type { Metadata } from "next";
import Link from "next/link";
import { buttonLinkClass } from "@/components/ui/button";
import { CalibrationList } from "@/components/methods/lists";
import { MethodsNav } from "@/components/methods/methods-nav";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { listCalibrations } from "@/lib/methods";
import { can } from "@/lib/permissions";
import { listQuerySchema } from "@/lib/schemas/methods";

export const metadata: Metadata = { title: "Calibration curves" };

export default async function CalibrationsPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const user = await requirePageUser("method:read", "/methods/calibrations");
  const q = listQuerySchema.parse(await searchParams);
  const list = await listCalibrations(await getDb(), user.labId, q);
  return (
    <>
      <PageHeader
        title="Methods"
        lede="Calibration curves: standards, the line through them with its uncertainties, and the limits of detection and quantitation."
        actions={can(user, "calibration:write") ? <Link href="/methods/calibrations/new" className={buttonLinkClass("primary")}>New calibration</Link> : undefined}
      />
      <MethodsNav current="calibrations" />
      <CalibrationList rows={list.rows} state={{ total: list.total, page: q.page, pageSize: q.pageSize, sort: q.sort, dir: q.dir, q: q.q }} />
    </>
  );
}
