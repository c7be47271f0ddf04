"use client";
// Setting the first password from an invitation link, under the lab's rules; then signed in at once. Posts to a server
// action (never GET), so it works before the scripts load and without them.
import { useActionState } from "react";
import { acceptInvitationAction, type PasswordFormState } from "@/app/sign-in/actions";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { FormErrors } from "./form-errors";

const START: PasswordFormState = { errors: [], email: "" };

export function SetPasswordForm({ token, minLength }: { token: string; minLength: number }) {
  const [state, action, busy] = useActionState(acceptInvitationAction, START);
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="token" value={token} />
      <Input label="New password" name="password" type="password" autoComplete="new-password" hint={`At least ${minLength} characters, and not your e-mail address.`} required />
      <Input label="The same password again" name="again" type="password" autoComplete="new-password" required />
      <FormErrors errors={state.errors} testId="set-password-error" />
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
