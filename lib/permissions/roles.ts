// The four roles of a lab membership.
export const ROLES = ["admin", "method_developer", "analyst", "reviewer"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Lab administrator",
  method_developer: "Method developer",
  analyst: "Analyst",
  reviewer: "Reviewer",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
