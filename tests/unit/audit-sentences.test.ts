// The audit trail in sentences: who did what to which record, old → new, and why (the codes stay in the CSV).
import { describe, expect, it } from "vitest";
import { auditSentence } from "@/lib/audit/sentences";

const base = { actorUserId: 3, objectType: null, objectId: null, objectVersion: null, oldValues: null, newValues: null, reason: null };

describe("audit sentences", () => {
  it("a decision names the person, the record and its version, the state change and the reason", () => {
    expect(auditSentence({ ...base, action: "fit.approved", actorLabel: "Rafe Okonkwo", objectType: "fit", objectId: "12", objectVersion: 2, oldValues: { state: "submitted" }, newValues: { state: "approved" }, reason: "residuals random" })).toBe(
      "Rafe Okonkwo approved fit record 12 version 2 (state: submitted → approved), because: residuals random.",
    );
  });
  it("a role change and a method assignment read as old → new", () => {
    expect(auditSentence({ ...base, action: "member.role_changed", actorLabel: "Lena Brandt", objectType: "user", objectId: "7", oldValues: { role: "analyst" }, newValues: { role: "reviewer" }, reason: "QA rota" })).toBe(
      "Lena Brandt changed the role of member 7 (role: analyst → reviewer), because: QA rota.",
    );
    expect(auditSentence({ ...base, action: "run.method_assigned", actorLabel: "Amara Quist", objectType: "run", objectId: "4", oldValues: { method: null }, newValues: { method: "Blue fade, 590 nm" }, reason: "confirmed" })).toBe(
      "Amara Quist changed the method of run 4 (method: none → Blue fade, 590 nm), because: confirmed.",
    );
  });
  it("a value that is a record reads as its name and version, and a value that only appears is not called a change", () => {
    expect(
      auditSentence({ ...base, action: "fit.version_saved", actorLabel: "Amara Quist", objectType: "fit", objectId: "1", objectVersion: 2, oldValues: { version: 1 }, newValues: { version: 2, method: { id: 1, record_id: 1, version: 1, name: "Blue fade" } }, reason: "bubble excluded" }),
    ).toBe("Amara Quist saved a new version of fit record 1 version 2, because: bubble excluded.");
    expect(auditSentence({ ...base, action: "run.method_assigned", actorLabel: "A", objectType: "run", objectId: "4", oldValues: { method: { name: "Old", version: 2 } }, newValues: { method: { name: "New", version: 1 } } })).toBe(
      "A changed the method of run 4 (method: Old v2 → New v1).",
    );
  });

  it("sign-ins have no object; an unknown code is still a sentence", () => {
    expect(auditSentence({ ...base, action: "auth.signed_in", actorLabel: "Amara Quist" })).toBe("Amara Quist signed in.");
    expect(auditSentence({ ...base, action: "x.y", actorLabel: null, actorUserId: null, objectType: "fit", objectId: "1" })).toBe("The system did “x.y” to fit record 1.");
  });
});
