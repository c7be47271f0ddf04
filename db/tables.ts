// Row types for every table, registered with Knex so queries are typed.
import type { Role } from "@/lib/permissions/roles";

export interface DbLabRow {
  id: number;
  slug: string;
  name: string;
  created_at: string;
}

export interface DbUserRow {
  id: number;
  email: string;
  display_name: string;
  password_hash: string;
  failed_sign_ins: number;
  locked_until: string | null;
  disabled: boolean | number;
  created_at: string;
}

export interface DbMembershipRow {
  id: number;
  user_id: number;
  lab_id: number;
  role: Role;
  created_at: string;
}

export interface DbAuditEventRow {
  id: number;
  lab_id: number | null;
  actor_user_id: number | null;
  actor_label: string | null;
  at: string;
  action: string;
  object_type: string | null;
  object_id: string | null;
  object_version: number | null;
  old_values: string | null;
  new_values: string | null;
  reason: string | null;
  prev_hash: string | null;
  hash: string;
}

declare module "knex/types/tables" {
  interface Tables {
    labs: DbLabRow;
    users: DbUserRow;
    memberships: DbMembershipRow;
    audit_events: DbAuditEventRow;
  }
}
