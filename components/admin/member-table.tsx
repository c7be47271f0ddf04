"use client";
// The lab's members on the shared server-side table, with each member's actions.
import { Badge } from "@/components/ui/badge";
import { DataTable, type DataColumn, type ServerListState } from "@/components/ui/data-table";
import { MemberActions } from "./member-actions";

export interface MemberRow {
  userId: number;
  email: string;
  name: string;
  role: string;
  roleLabel: string;
  disabled: boolean;
  locked: boolean;
  lockedUntil: string | null;
  since: string;
}

export function MemberTable({ rows, state, roles, selfId }: { rows: MemberRow[]; state: ServerListState; roles: Array<{ value: string; label: string }>; selfId: number }) {
  const columns: DataColumn<MemberRow>[] = [
    { id: "name", header: "Name", cell: ({ row }) => <span className="font-semibold">{row.original.name}</span> },
    { id: "email", header: "E-mail", cell: ({ row }) => row.original.email },
    { id: "role", header: "Role", cell: ({ row }) => row.original.roleLabel },
    {
      id: "account",
      header: "Account",
      enableSorting: false,
      cell: ({ row }) =>
        row.original.disabled ? <Badge tone="neutral">Disabled</Badge> : row.original.locked ? <Badge tone="fault">Locked until {row.original.lockedUntil!.slice(11, 16)} UTC</Badge> : <Badge tone="pass">Active</Badge>,
    },
    { id: "since", header: "Member since", cell: ({ row }) => row.original.since.slice(0, 10) },
    {
      id: "actions",
      header: "Actions",
      enableSorting: false,
      cell: ({ row }) => <MemberActions member={{ userId: row.original.userId, name: row.original.name, role: row.original.role, disabled: row.original.disabled, locked: row.original.locked }} roles={roles} self={row.original.userId === selfId} />,
    },
  ];
  return <DataTable caption="Lab members" columns={columns} rows={rows} state={state} searchLabel="Search name, e-mail or role" empty="No members." rowTestId={(r) => `member-${r.email}`} />;
}
