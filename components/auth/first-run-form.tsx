"use client";
// The first-run form: the set-up token from the server's console, the lab, and its first administrator.
import { useActionState } from "react";
import { firstRunAction, type FirstRunState } from "@/app/first-run/actions";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { FormErrors } from "./form-errors";

const START: FirstRunState = { errors: [], values: {} };

export function FirstRunForm({ token }: { token: string }) {
  const [state, action, busy] = useActionState(firstRunAction, START);
  const v = state.values;
  return (
    <form action={action} className="space-y-4">
      <Input label="Set-up token (printed on the server's console)" name="token" defaultValue={token} autoComplete="off" required />
      <Input label="Lab name" name="lab" defaultValue={v.lab} placeholder="North Shore Stability Lab" required />
      <Input label="Short name for addresses (lower case, digits, dashes)" name="slug" defaultValue={v.slug} placeholder="north-shore" required />
      <Input label="Your name" name="adminName" defaultValue={v.adminName} autoComplete="name" required />
      <Input label="Your e-mail" name="adminEmail" type="email" defaultValue={v.adminEmail} autoComplete="email" required />
      <Input label="Password" name="password" type="password" autoComplete="new-password" hint="At least 12 characters, and not your e-mail address." required />
      <Input label="The same password again" name="again" type="password" autoComplete="new-password" required />
      <FormErrors errors={state.errors} testId="first-run-error" />
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? "Creating…" : "Create the lab and sign in"}
      </Button>
    </form>
  );
}
