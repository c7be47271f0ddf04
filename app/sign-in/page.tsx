import type { Metadata } from "next";
import { SignInForm } from "@/components/auth/sign-in-form";
import { Mark } from "@/components/shell/mark";
import { safeNext } from "@/lib/auth/session-cookie";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  const target = safeNext(next);
  return (
    <main className="grid min-h-screen place-items-center px-4">
      <div className="w-full max-w-sm">
        <div className="mb-8 flex items-center gap-3">
          <Mark />
          <div>
            <p className="text-xl font-semibold tracking-tight">Halflight</p>
            <p className="text-sm text-ink-500">Absorbance kinetics you can sign for</p>
          </div>
        </div>
        <div className="rounded-cell bg-paper-raised p-6 shadow-lift">
          <h1 className="mb-5 text-lg font-semibold">Sign in to your lab</h1>
          <SignInForm next={target} />
        </div>
        <p className="mt-6 text-xs text-ink-500">
          Accounts are personal: never share a sign-in. Five wrong passwords in a row lock the account for 15 minutes.
        </p>
      </div>
    </main>
  );
}
