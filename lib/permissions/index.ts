// One table of who may do what (ARCHITECTURE.md "Roles"); every route, action and page asks `can`.
import type { Role } from "./roles";

export { ROLES, ROLE_LABELS, isRole, type Role } from "./roles";

const A = "analyst",
  M = "method_developer",
  R = "reviewer",
  D = "admin";

export const PERMISSIONS = {
  // Reading the lab's data: everyone who works with it; the administrator manages people, not data.
  "run:read": [A, M, R],
  "fit:read": [A, M, R],
  "study:read": [A, M, R],
  "method:read": [A, M, R],
  // Producing records.
  "run:upload": [A, M],
  "fit:write": [A, M],
  "fit:submit": [A, M],
  "study:write": [A, M],
  // Method development.
  "method:write": [M],
  "calibration:write": [M],
  "model:custom": [M],
  // Review (never of one's own work: checked against the record, see `canReview`).
  "review:read": [R],
  "review:comment": [R],
  "review:decide": [R],
  // Sharing a pinned record version: only who may read the record; any member may withdraw a link (the administrator
  // too, without reading the record).
  "share:create": [A, M, R],
  "share:revoke": [A, M, R, D],
  // Administration.
  "user:manage": [D],
  "audit:read": [D],
  "validation:run": [D],
  // Everyone signed in.
  "self:read": [A, M, R, D],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export interface Actor {
  userId: number;
  role: Role;
}

export function can(actor: Actor | null | undefined, permission: Permission): boolean {
  if (!actor) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(actor.role);
}

/** Segregation of duties: a reviewer may decide on a record only when someone else authored it. */
export function canReview(actor: Actor, record: { authorId: number }): boolean {
  return can(actor, "review:decide") && record.authorId !== actor.userId;
}

export const ALL_PERMISSIONS = Object.keys(PERMISSIONS) as Permission[];
