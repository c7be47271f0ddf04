"use client";
// Inviting a person by e-mail with a role, and the invitations sent (open, accepted, expired, withdrawn).
import { useRouter } from "next/navigation";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { Table, Td, Th } from "@/components/ui/table";
import { useToast } from "@/components/ui/toast";
import { problemText, sendJson } from "@/lib/http/client";
import { inviteSchema } from "@/lib/schemas/admin";
import type { InvitationSent } from "@/lib/schemas/responses";

interface InviteValues {
  email: string;
  name: string;
  role: string;
  days: string;
}
const toBody = (v: InviteValues) => ({ ...v, days: Number(v.days) });

interface Invitation {
  id: number;
  email: string;
  name: string;
  role: string;
  invited_by: string | null;
  created_at: string;
  expires_at: string;
  state: string;
}

export function Invitations({ invitations, roles }: { invitations: Invitation[]; roles: Array<{ value: string; label: string }> }) {
  const router = useRouter();
  const toast = useToast();
  const { register, handleSubmit, reset, getValues, formState } = useSchemaForm<InviteValues, typeof inviteSchema>(toBody, inviteSchema, { email: "", name: "", role: "analyst", days: "7" });
  const err = (path: keyof InviteValues) => fieldError(formState.errors, path);
  const roleLabel = (r: string) => roles.find((x) => x.value === r)?.label ?? r;

  const invite = handleSubmit(async (body) => {
    let out: InvitationSent;
    try {
      out = await sendJson<InvitationSent>("/api/admin/invitations", { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    toast(out.mailed ? `Invitation sent to ${body.email}.` : `Invitation saved, but no mail server is configured: ${body.email} has not been told.`, out.mailed ? "pass" : "fault");
    reset({ ...getValues(), email: "", name: "" });
    router.refresh();
  });
  async function withdraw(id: number) {
    try {
      await sendJson(`/api/admin/invitations/${id}`, { method: "DELETE" });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    toast("Invitation withdrawn.", "pass");
    router.refresh();
  }

  return (
    <section className="mt-10" aria-label="Invitations">
      <h2 className="mb-3 text-lg font-semibold">Invite someone</h2>
      <form
        className="mb-6 grid max-w-4xl gap-3 rounded-cell bg-paper-raised p-4 shadow-lift md:grid-cols-[1fr_1fr_12rem_7rem_auto] md:items-end"
        onSubmit={invite}
        noValidate
      >
        <Input label="E-mail" type="email" {...register("email")} error={err("email")} required />
        <Input label="Name" {...register("name")} error={err("name")} required />
        <Select label="Role" {...register("role")} error={err("role")} options={roles} />
        <Input label="Valid (days)" inputMode="numeric" {...register("days")} error={err("days")} />
        <Button type="submit" disabled={formState.isSubmitting} data-testid="send-invitation">
          {formState.isSubmitting ? "Sending…" : "Send invitation"}
        </Button>
      </form>
      <p className="-mt-4 mb-6 text-sm text-ink-500">The invitee gets a link that works once, until it expires, to set a password under the lab&apos;s rules.</p>
      {invitations.length > 0 && (
        <Table caption="Invitations">
          <thead>
            <tr>
              <Th>Invitee</Th>
              <Th>Role</Th>
              <Th>Sent</Th>
              <Th>Expires</Th>
              <Th>State</Th>
              <Th />
            </tr>
          </thead>
          <tbody>
            {invitations.map((i) => (
              <tr key={i.id} data-testid={`invitation-${i.email}`}>
                <Td>
                  <span className="font-semibold">{i.name}</span> <span className="text-ink-500">{i.email}</span>
                </Td>
                <Td>{roleLabel(i.role)}</Td>
                <Td>{i.created_at.slice(0, 16).replace("T", " ")} UTC by {i.invited_by ?? "—"}</Td>
                <Td>{i.expires_at.slice(0, 16).replace("T", " ")} UTC</Td>
                <Td>
                  <Badge tone={i.state === "accepted" ? "pass" : i.state === "open" ? "accent" : "neutral"}>{i.state}</Badge>
                </Td>
                <Td>
                  {i.state === "open" && (
                    <Button size="sm" variant="quiet" onClick={() => withdraw(i.id)}>
                      Withdraw
                    </Button>
                  )}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </section>
  );
}
