import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { FirstRunForm } from "@/components/auth/first-run-form";
import { Mark } from "@/components/shell/mark";
import { getDb } from "@/db";
import { needsFirstRun } from "@/lib/admin/setup";

export const metadata: Metadata = { title: "Set up this installation" };
export const dynamic = "force-dynamic";

// Public only while the database has no lab: the token printed on the server's console is the credential, so nobody
// who cannot read that console can claim a new install.
export default async function FirstRunPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  if (!(await needsFirstRun(await getDb()))) notFound();
  const { token } = await searchParams;
  return (
    <main className="grid min-h-screen place-items-center px-4 py-10">
      <div className="w-full max-w-md">
        <div className="mb-8 flex items-center gap-3">
          <Mark />
          <p className="text-xl font-semibold tracking-tight">Halflight</p>
        </div>
        <div className="rounded-cell bg-paper-raised p-6 shadow-lift">
          <h1 className="text-lg font-semibold">Set up this installation</h1>
          <p className="mb-5 mt-1 text-sm text-ink-700">
            Create your lab and its first lab administrator. The set-up token was printed on the server&apos;s console when it started; it works once, for 24 hours. You will invite the other members from Members.
          </p>
          <FirstRunForm token={typeof token === "string" ? token.slice(0, 200) : ""} />
        </div>
      </div>
    </main>
  );
}
