import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { StudyView } from "@/components/studies/study-view";
import { getDb } from "@/db";
import { DEMO_LAB } from "@/db/seeds/demo";
import { requirePageUser } from "@/lib/auth/page";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/permissions";
import { getStudyRecord } from "@/lib/studies";

export const metadata: Metadata = { title: "Study" };

export default async function StudyPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("study:read", `/studies/${id}`);
  const rec = await getStudyRecord(await getDb(), user.labId, Number(id)).catch((e: unknown) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  return <StudyView study={rec} canWrite={can(user, "study:write")} demoNote={user.labSlug === DEMO_LAB.slug} />;
}
