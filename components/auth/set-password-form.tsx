"use client";
// Setting the first password from an invitation link, under the lab's rules; then signed in at once.
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";

export function SetPasswordForm({ token, email, minLength }: { token: string; email: string; minLength: number }) {
  const router = useRouter();
  const [password, setPassword] = useState("");
  const [again, setAgain] = useState("");
  const [errors, setErrors] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (password !== again) {
      setErrors(["The two passwords differ."]);
      return;
    }
    setBusy(true);
    setErrors([]);
    const res = await fetch(`/api/invitations/${encodeURIComponent(token)}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ password }) });
    const body = await res.json();
    if (!res.ok) {
      setBusy(false);
      setErrors(body.error?.issues?.length ? body.error.issues.map((i: { message: string }) => i.message) : [body.error?.message ?? `The server answered ${res.status}.`]);
      return;
    }
    const s = await signIn("credentials", { email, password, redirect: false });
    setBusy(false);
    if (!s || s.error) {
      router.replace("/sign-in");
      return;
    }
    router.replace("/");
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4">
      <Input label="New password" type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} hint={`At least ${minLength} characters, and not your e-mail address.`} required />
      <Input label="The same password again" type="password" autoComplete="new-password" value={again} onChange={(e) => setAgain(e.target.value)} required />
      {errors.length > 0 && (
        <ul role="alert" data-testid="set-password-error" className="list-disc rounded-cell bg-fault-100 px-6 py-2 text-sm text-fault-700">
          {errors.map((x) => (
            <li key={x}>{x}</li>
          ))}
        </ul>
      )}
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
