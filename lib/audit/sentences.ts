// The audit trail in sentences a QA reviewer reads: who did what to which record, old → new where a value changed,
// and the reason. The codes themselves stay in the CSV export and the API.
import type { AuditEvent } from "@/lib/schemas/audit";

const VERBS: Record<string, string> = {
  "auth.signed_in": "signed in",
  "auth.sign_in_failed": "failed to sign in",
  "auth.sign_in_refused_locked": "was refused sign-in (account locked)",
  "auth.account_locked": "was locked out after repeated wrong passwords",
  "auth.password_failed": "entered a wrong password at a signing prompt",
  "auth.password_refused_locked": "was refused a signature (account locked)",
  "run.ingested": "uploaded",
  "run.method_assigned": "changed the method of",
  "fit.created": "saved",
  "fit.version_saved": "saved a new version of",
  "fit.submitted": "submitted for review",
  "fit.withdrawn": "withdrew from review",
  "fit.approved": "approved",
  "fit.rejected": "rejected",
  "comment.added": "commented on",
  "signature.refused": "was refused a signature on",
  "share.created": "made a share link to",
  "share.revoked": "revoked a share link to",
  "share.viewed": "opened a share link to",
  "share.viewed_outside": "opened (as an outside reviewer) a share link to",
  "study.created": "saved",
  "study.version_saved": "saved a new version of",
  "study.submitted": "submitted for review",
  "study.withdrawn": "withdrew from review",
  "study.approved": "approved",
  "study.rejected": "rejected",
  "method.created": "created",
  "method.version_saved": "saved a new version of",
  "calibration.created": "created",
  "validation.run": "ran the built-in validation",
  "validation.signed": "signed",
  "lab.created": "created",
  "lab.settings_changed": "changed the lab settings",
  "member.added": "added",
  "member.role_changed": "changed the role of",
  "member.unlock": "unlocked",
  "member.deactivate": "deactivated",
  "member.reactivate": "reactivated",
  "invitation.created": "invited",
  "invitation.revoked": "withdrew the invitation of",
  "invitation.accepted": "accepted an invitation",
  "api_key.created": "created an instrument key",
  "api_key.revoked": "revoked an instrument key",
  "integrity.checked": "ran the integrity check",
  "security.rate_limited": "was slowed down (rate limit)",
};

const OBJECTS: Record<string, string> = { fit: "fit record", study: "study", method: "method", run: "run", calibration: "calibration", user: "member", lab: "lab", validation: "validation run", api_key: "instrument key" };

function shown(v: unknown): string {
  if (v === null || v === undefined || v === "") return "none";
  if (typeof v === "string") return v.length > 60 ? `${v.slice(0, 57)}…` : v;
  if (typeof v === "number" || typeof v === "boolean") return String(v);
  // A record named in a value (a method, say): its name and version, never its JSON.
  const o = v as { name?: unknown; version?: unknown };
  if (typeof o.name === "string") return `${o.name}${typeof o.version === "number" ? ` v${o.version}` : ""}`;
  return "a changed value";
}

/** The fields whose change the sentence names (old → new), in a fixed order. */
const NAMED = ["state", "role", "method", "outside_links", "default_link_days", "upload_limit_mb", "password_min_length", "disabled", "temperature_c"];

export function auditSentence(e: Pick<AuditEvent, "action" | "actorLabel" | "actorUserId" | "objectType" | "objectId" | "objectVersion" | "oldValues" | "newValues" | "reason">): string {
  const who = e.actorLabel ?? (e.actorUserId ? `user #${e.actorUserId}` : "The system");
  const verb = VERBS[e.action] ?? `did “${e.action}” to`;
  const object = e.objectType ? `${OBJECTS[e.objectType] ?? e.objectType} ${e.objectId ?? ""}${e.objectVersion ? ` version ${e.objectVersion}` : ""}`.trim() : "";
  const needsObject = !/signed in|failed to sign in|refused sign-in|locked out|wrong password|refused a signature \(|ran the|changed the lab settings|accepted an invitation|instrument key|slowed down/.test(verb);
  let s = `${who} ${verb}${needsObject && object ? ` ${object}` : ""}`;
  const oldV = (e.oldValues ?? {}) as Record<string, unknown>;
  const newV = (e.newValues ?? {}) as Record<string, unknown>;
  // Only what changed: a field in both the old and the new values, with different values.
  const changes = NAMED.filter((k) => k in newV && k in oldV && shown(oldV[k]) !== shown(newV[k])).map((k) => `${k.replace(/_/g, " ")}: ${shown(oldV[k])} → ${shown(newV[k])}`);
  if (changes.length) s += ` (${changes.join("; ")})`;
  if (e.reason) s += `, because: ${e.reason}`;
  return `${s}.`;
}
