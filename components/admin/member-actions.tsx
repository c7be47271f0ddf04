"use client";
// An administrator's actions on one member: change the role, unlock, deactivate or reactivate; a reason each time.
// The dialog's form is checked with the route's own schema (memberActionSchema).
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useWatch } from "react-hook-form";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { problemText, sendJson } from "@/lib/http/client";
import { memberActionSchema } from "@/lib/schemas/members";

type Action = "unlock" | "deactivate" | "reactivate" | "role";

interface Values {
  role: string;
  reason: string;
}

export function MemberActions({ member, roles, self }: { member: { userId: number; name: string; role: string; disabled: boolean; locked: boolean }; roles: Array<{ value: string; label: string }>; self: boolean }) {
  const router = useRouter();
  const toast = useToast();
  const [action, setAction] = useState<Action | null>(null);
  const toBody = (v: Values) => ({ action, reason: v.reason, ...(action === "role" ? { role: v.role } : {}) });
  const { register, handleSubmit, control, reset, formState } = useSchemaForm<Values, typeof memberActionSchema>(toBody, memberActionSchema, { role: member.role, reason: "" });
  const reason = useWatch({ control, name: "reason" });
  if (self) return <span className="text-xs text-ink-500">your own account</span>;

  const send = handleSubmit(async (body) => {
    try {
      await sendJson(`/api/admin/members/${member.userId}`, { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    toast("Saved, and written to the audit trail.", "pass");
    setAction(null);
    reset({ role: body.action === "role" ? body.role : member.role, reason: "" });
    router.refresh();
  });

  return (
    <div className="flex flex-wrap gap-1">
      <Button size="sm" variant="quiet" onClick={() => setAction("role")}>
        Role…
      </Button>
      {member.locked && (
        <Button size="sm" variant="quiet" onClick={() => setAction("unlock")}>
          Unlock…
        </Button>
      )}
      <Button size="sm" variant="quiet" onClick={() => setAction(member.disabled ? "reactivate" : "deactivate")}>
        {member.disabled ? "Reactivate…" : "Deactivate…"}
      </Button>
      <Dialog open={action !== null} onClose={() => setAction(null)} title={`${action === "role" ? "Change the role of" : action === "unlock" ? "Unlock" : action === "deactivate" ? "Deactivate" : "Reactivate"} ${member.name}`}>
        <form className="space-y-4" onSubmit={send} noValidate>
          {action === "role" && <Select label="Role" {...register("role")} error={fieldError(formState.errors, "role")} options={roles} />}
          {action === "deactivate" && <p className="text-sm">The account can no longer sign in; nothing is deleted and every record stays attributed to {member.name}.</p>}
          <Input label="Reason (required)" {...register("reason")} error={fieldError(formState.errors, "reason")} required />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setAction(null)}>
              Cancel
            </Button>
            <Button type="submit" disabled={formState.isSubmitting || (reason ?? "").trim().length < 3}>
              Save
            </Button>
          </div>
        </form>
      </Dialog>
    </div>
  );
}
