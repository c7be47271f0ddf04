"use client";
// Inviting a person by e-mail with a role, and the invitations sent (open, accepted, expired, withdrawn).
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { Table, Td, Th } from "@/components/ui/table";
import { useToast } from "@/components/ui/toast";
import { problemText, sendJson } from "@/lib/http/client";

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
  const [email, setEmail] = useState("");
  const [name, setName] = useState("");
  const [role, setRole] = useState("analyst");
  const [days, setDays] = useState("7");
  const [busy, setBusy] = useState(false);
  const roleLabel = (r: string) => roles.find((x) => x.value === r)?.label ?? r;

  async function invite() {
    setBusy(true);
    let body: { mailed: boolean };
    try {
      body = await sendJson<{ mailed: boolean }>("/api/admin/invitations", { body: { email, name, role, days: Number(days) } });
    } catch (e) {
      return toast(problemText(e), "fault");
    } finally {
      setBusy(false);
    }
    toast(body.mailed ? `Invitation sent to ${email}.` : `Invitation saved, but no mail server is configured: ${email} has not been told.`, body.mailed ? "pass" : "fault");
    setEmail("");
    setName("");
    router.refresh();
  }
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
        onSubmit={(e) => {
          e.preventDefault();
          void invite();
        }}
      >
        <Input label="E-mail" type="email" value={email} onChange={(e) => setEmail(e.target.value)} required />
        <Input label="Name" value={name} onChange={(e) => setName(e.target.value)} required />
        <Select label="Role" value={role} onChange={(e) => setRole(e.target.value)} options={roles} />
        <Input label="Valid (days)" inputMode="numeric" value={days} onChange={(e) => setDays(e.target.value)} />
        <Button type="submit" disabled={busy} data-testid="send-invitation">
          {busy ? "Sending…" : "Send invitation"}
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
