// The part of every record's PDF a reviewer reads last: comments with their authors, signature blocks (printed name,
// meaning, UTC time, the signed hash, VOID where the record no longer matches) and the record's audit events in words.
import { auditSentence } from "@/lib/audit/sentences";
import type { AuditRowWithActor } from "@/db/queries/audit";
import type { ReviewStatus } from "@/lib/reviews";

type Line = (text: string, size?: number) => void;

interface TrailComment {
  created_at: string;
  author: string;
  parent_id: number | null;
  body: string;
}

type TrailAudit = AuditRowWithActor;

export function printComments(line: Line, heading: (t: string) => void, comments: readonly TrailComment[]): void {
  heading("Comments");
  if (comments.length === 0) line("None.", 9);
  for (const c of comments) line(`${c.created_at.replace("T", " ").slice(0, 16)} UTC · ${c.author}${c.parent_id ? " (reply)" : ""}: ${c.body}`, 9);
}

export function printSignatures(line: Line, heading: (t: string) => void, signatures: ReviewStatus["signatures"]): void {
  heading("Signatures");
  if (signatures.length === 0) line("None.", 9);
  for (const s of signatures)
    line(`${s.printed_name} · ${s.meaning.toUpperCase()} · ${s.signed_at.replace("T", " ").slice(0, 19)} UTC · signed hash ${s.content_hash}${s.void ? " · VOID (the record no longer matches)" : ""}`, 9);
}

export function printAudit(line: Line, heading: (t: string) => void, audit: readonly TrailAudit[]): void {
  heading("Audit events of this record");
  for (const a of audit)
    line(
      `${a.at.replace("T", " ").slice(0, 19)} UTC  ${auditSentence({ action: a.action, actorLabel: a.actor_name ?? a.actor_label, actorUserId: a.actor_user_id, objectType: a.object_type, objectId: a.object_id, objectVersion: a.object_version, oldValues: a.old_values, newValues: a.new_values, reason: a.reason })}`,
      8,
    );
}
