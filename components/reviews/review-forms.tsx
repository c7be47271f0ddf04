"use client";
// The review's two forms, each checked with its route's own schema: the signed act (submit, approve, reject, each with
// the password; withdraw with a reason) and a comment.
import { useWatch } from "react-hook-form";
import type { z } from "zod";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input, Select } from "@/components/ui/field";
import { commentSchema, decisionSchema, submitSchema, withdrawSchema } from "@/lib/schemas/reviews";

export type Act = "submit" | "approve" | "reject" | "withdraw";

interface SignValues {
  password: string;
  reason: string;
  meaning: "approved" | "reviewed";
}

/** Each act's route, body and schema. */
export function actRequest(act: Act, base: string, v: SignValues): { url: string; body: unknown; schema: z.ZodType } {
  switch (act) {
    case "submit":
      return { url: `${base}/submit`, body: { password: v.password }, schema: submitSchema };
    case "approve":
      return { url: `${base}/decision`, body: { decision: "approved", password: v.password, meaning: v.meaning }, schema: decisionSchema };
    case "reject":
      return { url: `${base}/decision`, body: { decision: "rejected", password: v.password, reason: v.reason, meaning: "reviewed" }, schema: decisionSchema };
    case "withdraw":
      return { url: `${base}/withdraw`, body: { reason: v.reason }, schema: withdrawSchema };
  }
}

const TITLE: Record<Act, string> = { submit: "Submit for review", approve: "Approve this version", reject: "Reject this version", withdraw: "Withdraw the submission" };

export function SignDialog({ act, base, onClose, send }: { act: Act | null; base: string; onClose: () => void; send: (url: string, body: unknown) => Promise<boolean> }) {
  const a: Act = act ?? "submit";
  const { register, handleSubmit, control, reset, formState } = useSchemaForm<SignValues, z.ZodType>((v) => actRequest(a, base, v).body, actRequest(a, base, { password: "", reason: "", meaning: "approved" }).schema, { password: "", reason: "", meaning: "approved" });
  const [password, reason] = useWatch({ control, name: ["password", "reason"] });
  const err = (path: keyof SignValues) => fieldError(formState.errors, path);
  const close = () => {
    reset();
    onClose();
  };
  const confirm = handleSubmit(async (body) => {
    if (await send(actRequest(a, base, { password: "", reason: "", meaning: "approved" }).url, body)) close();
  });
  return (
    <Dialog open={act !== null} onClose={close} title={TITLE[a]}>
      <form method="post" className="space-y-4" onSubmit={confirm} noValidate>
        {a !== "withdraw" && (
          <p className="text-sm">
            This is an electronic signature: it records your name, the time and its meaning, and binds them to this exact version. Enter your password to sign.
          </p>
        )}
        {a === "approve" && <Select label="Meaning of the signature" {...register("meaning")} options={[{ value: "approved", label: "Approved" }, { value: "reviewed", label: "Reviewed" }]} />}
        {(a === "reject" || a === "withdraw") && <Input label="Reason (required)" {...register("reason")} error={err("reason")} required />}
        {a !== "withdraw" && <Input label="Your password" type="password" autoComplete="current-password" {...register("password")} error={err("password")} required />}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={close}>
            Cancel
          </Button>
          <Button type="submit" disabled={formState.isSubmitting || (a !== "withdraw" && !password) || ((a === "reject" || a === "withdraw") && (reason ?? "").trim().length < 3)} data-testid="sign">
            {a === "withdraw" ? "Withdraw" : "Sign"}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function CommentForm({ base, send }: { base: string; send: (url: string, body: unknown) => Promise<boolean> }) {
  const { register, handleSubmit, control, reset, formState } = useSchemaForm<{ body: string }, typeof commentSchema>((v) => v, commentSchema, { body: "" });
  const body = useWatch({ control, name: "body" });
  const add = handleSubmit(async (parsed) => {
    if (await send(`${base}/comments`, parsed)) reset({ body: "" });
  });
  return (
    <form className="mt-2 flex flex-wrap items-end gap-2" onSubmit={add} noValidate>
      <div className="min-w-0 flex-1 basis-56">
        <Input label="Add a comment" {...register("body")} error={fieldError(formState.errors, "body")} />
      </div>
      <Button type="submit" variant="secondary" disabled={!(body ?? "").trim() || formState.isSubmitting}>
        Comment
      </Button>
    </form>
  );
}
