// The role table against ARCHITECTURE.md "Roles (first cut)", written out cell by cell.
import { describe, expect, it } from "vitest";
import { ALL_PERMISSIONS, can, canReview, ROLES, type Permission, type Role } from "@/lib/permissions";

const EXPECTED: Record<Permission, Role[]> = {
  "run:read": ["analyst", "method_developer", "reviewer"],
  "fit:read": ["analyst", "method_developer", "reviewer"],
  "study:read": ["analyst", "method_developer", "reviewer"],
  "method:read": ["analyst", "method_developer", "reviewer"],
  "run:upload": ["analyst", "method_developer"],
  "fit:write": ["analyst", "method_developer"],
  "fit:submit": ["analyst", "method_developer"],
  "study:write": ["analyst", "method_developer"],
  "method:write": ["method_developer"],
  "calibration:write": ["method_developer"],
  "model:custom": ["method_developer"],
  "review:read": ["reviewer"],
  "review:comment": ["reviewer"],
  "review:decide": ["reviewer"],
  "share:create": ["analyst", "method_developer", "reviewer"],
  "share:revoke": ["analyst", "method_developer", "reviewer", "admin"],
  "user:manage": ["admin"],
  "audit:read": ["admin"],
  "validation:run": ["admin"],
  "self:read": ["analyst", "method_developer", "reviewer", "admin"],
};

describe("permission matrix", () => {
  it("has an expectation for every permission", () => {
    expect([...ALL_PERMISSIONS].sort()).toEqual(Object.keys(EXPECTED).sort());
  });
  for (const p of ALL_PERMISSIONS) {
    for (const role of ROLES) {
      const allowed = EXPECTED[p].includes(role);
      it(`${role} ${allowed ? "may" : "may not"} ${p}`, () => {
        expect(can({ userId: 1, role }, p)).toBe(allowed);
      });
    }
  }
  it("refuses everything to nobody", () => {
    for (const p of ALL_PERMISSIONS) expect(can(null, p)).toBe(false);
  });
  it("never lets a reviewer decide on their own record", () => {
    expect(canReview({ userId: 7, role: "reviewer" }, { authorId: 7 })).toBe(false);
    expect(canReview({ userId: 7, role: "reviewer" }, { authorId: 8 })).toBe(true);
    expect(canReview({ userId: 7, role: "analyst" }, { authorId: 8 })).toBe(false);
  });
});
