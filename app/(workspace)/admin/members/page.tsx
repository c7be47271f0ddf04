import type { Metadata } from "next";
import { Invitations } from "@/components/admin/invitations";
import { MemberTable } from "@/components/admin/member-table";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { listInvitations } from "@/lib/admin/invitations";
import { pageMembers } from "@/lib/admin/members";
import { requirePageUser } from "@/lib/auth/page";
import { ROLE_LABELS, ROLES } from "@/lib/permissions";
import { listQuerySchema } from "@/lib/schemas/methods";

export const metadata: Metadata = { title: "Lab members" };

export default async function MembersPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const user = await requirePageUser("user:manage", "/admin/members");
  const q = listQuerySchema.parse({ sort: "name", dir: "asc", ...(await searchParams) });
  const db = await getDb();
  const { rows, total } = await pageMembers(db, user.labId, q);
  const now = new Date();
  const roles = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
  return (
    <>
      <PageHeader title="Lab members" lede={`Everyone with an account in ${user.labName}, and the role each holds. Accounts are never deleted: deactivate them, and their records stay attributed.`} />
      <MemberTable
        rows={rows.map((m) => ({ ...m, roleLabel: ROLE_LABELS[m.role], locked: Boolean(m.lockedUntil && new Date(m.lockedUntil) > now) }))}
        state={{ total, page: q.page, pageSize: q.pageSize, sort: q.sort, dir: q.dir, q: q.q }}
        roles={roles}
        selfId={user.userId}
      />
      <Invitations invitations={await listInvitations(db, user.labId)} roles={roles} />
    </>
  );
}
