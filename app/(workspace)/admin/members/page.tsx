import type { Metadata } from "next";
import { MemberActions } from "@/components/admin/member-actions";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { Table, Td, Th } from "@/components/ui/table";
import { getDb } from "@/db";
import { listMembers } from "@/lib/admin/members";
import { requirePageUser } from "@/lib/auth/page";
import { ROLE_LABELS, ROLES } from "@/lib/permissions";

export const metadata: Metadata = { title: "Lab members" };

export default async function MembersPage() {
  const user = await requirePageUser("user:manage", "/admin/members");
  const members = await listMembers(await getDb(), user.labId);
  const now = new Date();
  return (
    <>
      <PageHeader title="Lab members" lede={`Everyone with an account in ${user.labName}, and the role each holds.`} />
      <Table caption="Lab members">
        <thead>
          <tr>
            <Th>Name</Th>
            <Th>E-mail</Th>
            <Th>Role</Th>
            <Th>Account</Th>
            <Th>Actions</Th>
          </tr>
        </thead>
        <tbody>
          {members.map((m) => {
            const locked = m.lockedUntil && new Date(m.lockedUntil) > now;
            return (
              <tr key={m.userId}>
                <Td className="font-semibold">{m.name}</Td>
                <Td>{m.email}</Td>
                <Td>{ROLE_LABELS[m.role]}</Td>
                <Td>
                  {m.disabled ? (
                    <Badge tone="neutral">Disabled</Badge>
                  ) : locked ? (
                    <Badge tone="fault">Locked until {m.lockedUntil!.slice(11, 16)} UTC</Badge>
                  ) : (
                    <Badge tone="pass">Active</Badge>
                  )}
                </Td>
                <Td>
                  <MemberActions
                    member={{ userId: m.userId, name: m.name, role: m.role, disabled: m.disabled, locked: Boolean(locked) }}
                    roles={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
                    self={m.userId === user.userId}
                  />
                </Td>
              </tr>
            );
          })}
        </tbody>
      </Table>
      <p className="mt-4 text-sm text-ink-500">Not built yet: invitations by e-mail. Accounts are never deleted: deactivate them.</p>
    </>
  );
}
