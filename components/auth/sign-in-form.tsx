"use client";
// Posts to a server action (method POST, never GET): works before the scripts load and without them.
import { useActionState } from "react";
import { signInAction, type PasswordFormState } from "@/app/sign-in/actions";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";

const START: PasswordFormState = { errors: [], email: "" };

export function SignInForm({ next }: { next: string }) {
  const [state, action, busy] = useActionState(signInAction, START);
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="next" value={next} />
      <Input label="E-mail" name="email" type="email" autoComplete="username" defaultValue={state.email} key={state.email} required />
      <Input label="Password" name="password" type="password" autoComplete="current-password" required />
      {state.errors.length > 0 && (
        <p role="alert" data-testid="sign-in-error" className="rounded-cell bg-fault-100 px-3 py-2 text-sm text-fault-700">
          {state.errors.join(" ")}
        </p>
      )}
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? "Checking…" : "Sign in"}
      </Button>
    </form>
  );
}
