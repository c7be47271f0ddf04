import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { FirstRunForm } from "@/components/auth/first-run-form";
import { AuthCard } from "@/components/auth/auth-card";
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
    <AuthCard
      title="Set up this installation"
      lede="Create your lab and its first lab administrator. The set-up token was printed on the server's console when it started; it works once, for 24 hours. You will invite the other members from Members."
    >
      <FirstRunForm token={typeof token === "string" ? token.slice(0, 200) : ""} />
    </AuthCard>
  );
}
