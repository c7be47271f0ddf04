"use client";
// An administrator's actions on one member: change the role, unlock, deactivate or reactivate; a reason each time.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { problemText, useSend } from "@/lib/http/client";

type Action = "unlock" | "deactivate" | "reactivate" | "role";

export function MemberActions({ member, roles, self }: { member: { userId: number; name: string; role: string; disabled: boolean; locked: boolean }; roles: Array<{ value: string; label: string }>; self: boolean }) {
  const router = useRouter();
  const toast = useToast();
  const [action, setAction] = useState<Action | null>(null);
  const [role, setRole] = useState(member.role);
  const [reason, setReason] = useState("");
  const change = useSend<{ action: Action | null; reason: string; role?: string }>(`/api/admin/members/${member.userId}`);
  if (self) return <span className="text-xs text-ink-500">your own account</span>;

  async function send() {
    try {
      await change.trigger({ action, reason, ...(action === "role" ? { role } : {}) });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    toast("Saved, and written to the audit trail.", "pass");
    setAction(null);
    setReason("");
    router.refresh();
  }

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
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            void send();
          }}
        >
          {action === "role" && <Select label="Role" value={role} onChange={(e) => setRole(e.target.value)} options={roles} />}
          {action === "deactivate" && <p className="text-sm">The account can no longer sign in; nothing is deleted and every record stays attributed to {member.name}.</p>}
          <Input label="Reason (required)" value={reason} onChange={(e) => setReason(e.target.value)} required />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setAction(null)}>
              Cancel
            </Button>
            <Button type="submit" disabled={change.isMutating || reason.trim().length < 3}>
              Save
            </Button>
          </div>
        </form>
      </Dialog>
    </div>
  );
}
