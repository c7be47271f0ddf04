import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { StudyView } from "@/components/studies/study-view";
import { getDb } from "@/db";
import { DEMO_LAB } from "@/db/seeds/demo";
import { orNotFound, requirePageUser } from "@/lib/auth/page";
import { can } from "@/lib/permissions";
import { listFits } from "@/lib/fits";
import { residualPanelsScene } from "@/lib/reports/rate-plot";
import { sceneToSvg } from "@/lib/reports/fit-plot";
import { getStudyRecord, type StudyGlobal } from "@/lib/studies";

export const metadata: Metadata = { title: "Study" };

export default async function StudyPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("study:read", `/studies/${id}`);
  const rec = await getStudyRecord(await getDb(), user.labId, Number(id)).catch(orNotFound);
  const db = await getDb();
  // The fits that may be added: the lab's saved fits not already in the study, to pick from by name, run or temperature.
  const inStudy = new Set(rec.members.map((m) => m.fitId));
  const candidates = can(user, "study:write")
    ? (await listFits(db, user.labId, { sort: "created_at", dir: "desc", page: 1, pageSize: 200 })).fits
        .filter((f) => !inStudy.has(f.id) && f.k_value !== null)
        .map((f) => ({ id: f.id, label: `${f.title} v${f.version} · ${f.run_name} · ${f.temperature_c ?? "?"} °C` }))
    : [];
  // The global fit's residual panels, drawn here as SVG (the same scene the PDF draws).
  const g = (rec.results as { global?: StudyGlobal }).global;
  const strips = (g?.runs ?? []).filter((r) => r.residuals).map((r) => ({ label: r.run_name, t: r.residuals!.t, r: r.residuals!.r }));
  const residualSvg = strips.length ? sceneToSvg(residualPanelsScene(strips), "Residuals of each run under the shared law") : null;
  return (
    <StudyView
      residualSvg={residualSvg}
      canShare={can(user, "share:create")}
      study={rec}
      canWrite={can(user, "study:write")}
      demoNote={user.labSlug === DEMO_LAB.slug}
      candidates={candidates}
      review={{ isAuthor: rec.author_id === user.userId, mayDecide: can(user, "review:decide"), maySubmit: can(user, "study:write") && rec.newest_id === rec.id }}
    />
  );
}
