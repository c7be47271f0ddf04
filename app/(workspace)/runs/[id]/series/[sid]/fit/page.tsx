import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { FitWorkspace } from "@/components/fits/fit-workspace";
import { getDb } from "@/db";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { getFitRecord } from "@/lib/fits";
import { ENGINE_VERSION } from "@/lib/kinetics/constants";
import { can } from "@/lib/permissions";
import { methodForWorkspace, runWavelengthMismatch } from "@/lib/methods";
import { getRunDetail } from "@/lib/runs";

export const metadata: Metadata = { title: "Fit a series" };

export default async function FitPage({ params, searchParams }: { params: Promise<{ id: string; sid: string }>; searchParams: Promise<{ models?: string; from?: string }> }) {
  const { id, sid } = await params;
  const sp = await searchParams;
  const user = await requirePageUser("fit:read", `/runs/${id}/series/${sid}/fit`);
  const db = await getDb();
  const run = await getRunDetail(db, user.labId, Number(id)).catch(orNotFound);
  const series = run.series.find((s) => s.id === Number(sid));
  if (!series) notFound();
  const from = sp.from ? await getFitRecord(db, user.labId, Number(sp.from)).catch(orNotFound) : null;
  if (from && (from.series.id !== series.id || from.run.id !== run.id)) notFound();
  const mismatch = await runWavelengthMismatch(db, user.labId, run.id);
  return (
    <>
    {mismatch && (
      <p className="mb-4 rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700" data-testid="wavelength-caution">
        Wavelength mismatch: the run&apos;s method ({mismatch.method}) is for {mismatch.method_nm} nm, but this run was measured at {mismatch.run_nm} nm. Its conversion and criteria may not hold.
      </p>
    )}
    <FitWorkspace
      run={{ id: run.id, name: run.name, wavelength_nm: run.wavelength_nm, path_length_cm: run.path_length_cm, temperature_c: run.temperature_c }}
      series={{ id: series.id, name: series.name, points: series.points, unit: series.unit, quantity: series.quantity }}
      initialModels={sp.models ? sp.models.split(",").filter(Boolean) : null}
      from={from ? { id: from.id, version: from.version, title: from.title, options: from.options } : null}
      canSave={can(user, "fit:write")}
      engineVersion={ENGINE_VERSION}
      method={await methodForWorkspace(db, user.labId, run.method_record_id)}
    />
    </>
  );
}
