import type { Metadata } from "next";
import Link from "next/link";
import { FitRecordView } from "@/components/fits/fit-record-view";
import { StudyShareView } from "@/components/studies/study-share-view";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { AppError } from "@/lib/errors";
import { getSessionUser } from "@/lib/auth/session";
import { openShareLink, openShareLinkOutside } from "@/lib/sharing";

export const metadata: Metadata = { title: "Shared record" };

// A share link opens one pinned record version for signed-in members of its lab, and, where the lab's settings allow
// outside reviewers, read-only without an account; every open is logged.
export default async function SharePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const session = await getSessionUser();
  const user = session ?? null;
  let opened: { object_type: "fit" | "study"; fit_id: number; expires_at: string; lab_id?: number; lab_name?: string };
  try {
    opened = user ? await openShareLink(await getDb(), user, token) : await openShareLinkOutside(await getDb(), token);
  } catch (e) {
    if (!(e instanceof AppError)) throw e;
    if (e.code === "unauthorized") await requirePageUser(undefined, `/share/${token}`);
    return (
      <main className="grid min-h-[60vh] place-items-center px-4">
        <div className="max-w-md text-center">
          <p className="font-mono text-sm text-ink-500">{e.status}</p>
          <h1 className="mt-2 text-2xl font-semibold">{e.code === "gone" ? "This link is no longer open" : "No such link"}</h1>
          <p className="mt-3 text-ink-700" data-testid="share-message">{e.message}</p>
          <Link href={user ? "/" : "/sign-in"} className="mt-6 inline-block font-semibold text-quartz-700 hover:underline">{user ? "Back to your workspace" : "Sign in"}</Link>
        </div>
      </main>
    );
  }
  const banner = user ? (
    <p className="mb-4 rounded-cell bg-quartz-100 px-4 py-2 text-sm text-quartz-700" data-testid="share-banner">
      Opened from a share link pinned to this version (expires {opened.expires_at.slice(0, 10)}). <Link className="font-semibold underline" href="/">Your workspace</Link>
    </p>
  ) : (
    <p className="mb-4 rounded-cell bg-quartz-100 px-4 py-2 text-sm text-quartz-700" data-testid="share-banner">
      {opened.lab_name} shared this with you read-only: one version of the record, as it was saved (the link expires {opened.expires_at.slice(0, 10)}; each opening is logged). To comment or sign, ask the lab for a reviewer account.
    </p>
  );
  if (opened.object_type === "study")
    return (
      <main className="px-gutter py-8 lg:px-10">
        <StudyShareView labId={opened.lab_id ?? user!.labId} id={opened.fit_id} banner={banner} />
      </main>
    );
  return (
    <main className="px-gutter py-8 lg:px-10">
      <FitRecordView
        user={user}
        labId={opened.lab_id}
        id={opened.fit_id}
        banner={banner}
      />
    </main>
  );
}
