"use client";
// The lab's settings, changed with a reason (audited with old and new values); checked with the route's own schema.
import { useRouter } from "next/navigation";
import { useWatch } from "react-hook-form";
import { fieldError, formMessages, serverProblem, useSchemaForm } from "@/components/forms/schema-form";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { sendJson } from "@/lib/http/client";
import { labSettingsSchema } from "@/lib/schemas/admin";

interface Values {
  outside_links: boolean;
  default_link_days: string;
  upload_limit_mb: string;
  password_min_length: string;
  reason: string;
}

const toBody = (v: Values) => ({ ...v, default_link_days: Number(v.default_link_days), upload_limit_mb: Number(v.upload_limit_mb), password_min_length: Number(v.password_min_length) });

export function LabSettingsForm({ initial }: { initial: { outside_links: boolean; default_link_days: number; upload_limit_mb: number; password_min_length: number } }) {
  const router = useRouter();
  const toast = useToast();
  const { register, handleSubmit, control, setError, reset, formState } = useSchemaForm<Values, typeof labSettingsSchema>(toBody, labSettingsSchema, {
    outside_links: initial.outside_links,
    default_link_days: String(initial.default_link_days),
    upload_limit_mb: String(initial.upload_limit_mb),
    password_min_length: String(initial.password_min_length),
    reason: "",
  });
  const reason = useWatch({ control, name: "reason" });
  const err = (path: keyof Values) => fieldError(formState.errors, path);
  const problems = formMessages(formState.errors);
  const save = handleSubmit(async (body) => {
    try {
      await sendJson("/api/admin/settings", { method: "PUT", body });
    } catch (e) {
      setError("root.server", serverProblem(e));
      return;
    }
    toast("Settings saved, and written to the audit trail.", "pass");
    reset({ ...body, default_link_days: String(body.default_link_days), upload_limit_mb: String(body.upload_limit_mb), password_min_length: String(body.password_min_length), reason: "" });
    router.refresh();
  });
  return (
    <form className="max-w-2xl space-y-4 rounded-cell bg-paper-raised p-5 shadow-lift" onSubmit={save} noValidate>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" {...register("outside_links")} className="mt-1" />
        <span>
          <span className="font-semibold">Share links may be sent to outside reviewers</span>
          <span className="block text-ink-500">On: a link may be mailed to someone outside the lab, who opens that one pinned version read-only without an account. Off: links go to members only, who sign in to open them. Every opening is logged.</span>
        </span>
      </label>
      <div className="grid gap-4 sm:grid-cols-3">
        <Input label="Share links expire after (days)" inputMode="numeric" {...register("default_link_days")} error={err("default_link_days")} />
        <Input label="Upload limit (MB per file)" inputMode="numeric" {...register("upload_limit_mb")} error={err("upload_limit_mb")} hint="At most 50 MB, the server's own limit." />
        <Input label="Passwords at least (characters)" inputMode="numeric" {...register("password_min_length")} error={err("password_min_length")} hint="10 or more; never the e-mail address." />
      </div>
      <Input label="Why this change (required)" {...register("reason")} error={err("reason")} required minLength={3} />
      {problems.length > 0 && (
        <ul role="alert" className="list-disc pl-5 text-sm text-fault-700">
          {problems.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      )}
      <Button type="submit" disabled={formState.isSubmitting || (reason ?? "").trim().length < 3}>
        Save settings
      </Button>
    </form>
  );
}
