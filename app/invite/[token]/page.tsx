import type { Metadata } from "next";
import Link from "next/link";
import { SetPasswordForm } from "@/components/auth/set-password-form";
import { AuthCard } from "@/components/auth/auth-card";
import { getDb } from "@/db";
import { openInvitation } from "@/lib/admin/invitations";
import { AppError } from "@/lib/errors";
import { ROLE_LABELS } from "@/lib/permissions";

export const metadata: Metadata = { title: "Accept an invitation" };

// Public: the one-time token in the link is the invitee's only credential until a password is set.
export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let opened;
  try {
    opened = await openInvitation(await getDb(), token);
  } catch (e) {
    if (!(e instanceof AppError)) throw e;
    return (
      <main className="grid min-h-screen place-items-center px-4">
        <div className="max-w-md text-center">
          <h1 className="text-2xl font-semibold">This invitation cannot be used</h1>
          <p className="mt-3 text-ink-700" data-testid="invite-message">{e.message}</p>
          <Link href="/sign-in" className="mt-6 inline-block font-semibold text-quartz-700 hover:underline">Go to sign-in</Link>
        </div>
      </main>
    );
  }
  const inv = opened.invitation;
  return (
    <AuthCard
      title={`Welcome, ${inv.display_name}`}
      lede={`You are invited to ${opened.lab.name} as ${ROLE_LABELS[inv.role].toLowerCase()}. Choose a password for ${inv.email}.`}
      footer={<p className="mt-6 text-xs text-ink-500">The link works once and expires {inv.expires_at.slice(0, 16).replace("T", " ")} UTC. Your account is personal: never share a sign-in.</p>}
    >
      <SetPasswordForm token={token} minLength={opened.password_min_length} />
    </AuthCard>
  );
}
