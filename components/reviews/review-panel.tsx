"use client";
// A record version's review: its state, signature blocks (void when the hash no longer matches), the signed acts the
// user may take (each re-asks the password), and the comments.
import { useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { useToast } from "@/components/ui/toast";
import { fetcher } from "@/lib/http/fetcher";
import type { ReviewStatus } from "@/lib/reviews";
import { problemText, sendJson } from "@/lib/http/client";
import { CommentForm, SignDialog, type Act } from "./review-forms";

const TONE = { draft: "neutral", submitted: "accent", approved: "pass", rejected: "fault", withdrawn: "caution" } as const;

export function ReviewPanel({ record, isAuthor, mayDecide, maySubmit }: { record: { type: "fit" | "study"; id: number }; isAuthor: boolean; mayDecide: boolean; maySubmit: boolean }) {
  const toast = useToast();
  const base = `/api/${record.type === "fit" ? "fits" : "studies"}/${record.id}`;
  const status = useSWR<ReviewStatus>(`${base}/review`, fetcher);
  const comments = useSWR<{ comments: Array<{ id: number; author: string; body: string; created_at: string }> }>(`${base}/comments`, fetcher);
  const [act, setAct] = useState<Act | null>(null);

  if (status.error) return <p role="alert" className="text-fault-700">The review status could not be loaded: {status.error.message}</p>;
  if (!status.data) return <div className="h-32 animate-pulse rounded-cell bg-paper-sunk" aria-label="Loading the review" />;
  const s = status.data;

  const DONE: Record<string, string> = { submit: "Submitted for review, signed.", decision: "Signed.", withdraw: "Submission withdrawn.", comments: "Comment added." };
  /** Sends a signed act or a comment; says what happened; refreshes the status and comments. */
  async function send(url: string, body: unknown): Promise<boolean> {
    try {
      await sendJson(url, { body });
    } catch (e) {
      toast(problemText(e), "fault");
      return false;
    }
    const decided = (body as { decision?: string }).decision;
    toast(decided === "approved" ? "Approved, signed." : decided === "rejected" ? "Rejected, signed." : (DONE[url.split("/").pop()!] ?? "Saved."), "pass");
    await Promise.all([status.mutate(), comments.mutate()]);
    return true;
  }

  return (
    <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Review and signatures" data-testid="review-panel">
      <div className="flex flex-wrap items-center gap-3">
        <h2 className="text-lg font-semibold">Review</h2>
        <span data-testid="review-state">
          <Badge tone={TONE[s.state]}>{s.state}</Badge>
        </span>
        {s.superseded_by && (
          <Badge tone="caution">
            superseded by version {s.superseded_by.version}
          </Badge>
        )}
        <div className="ml-auto flex gap-2">
          {maySubmit && (s.state === "draft" || s.state === "withdrawn") && !s.superseded_by && (
            <Button size="sm" onClick={() => setAct("submit")} data-testid="submit-review">
              Submit for review…
            </Button>
          )}
          {isAuthor && s.state === "submitted" && (
            <Button size="sm" variant="secondary" onClick={() => setAct("withdraw")}>
              Withdraw…
            </Button>
          )}
          {mayDecide && !isAuthor && s.state === "submitted" && (
            <>
              <Button size="sm" onClick={() => setAct("approve")} data-testid="approve">
                Approve…
              </Button>
              <Button size="sm" variant="danger" onClick={() => setAct("reject")}>
                Reject…
              </Button>
            </>
          )}
        </div>
      </div>
      {s.superseded_by && s.state === "approved" && (
        <p className="mt-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700" data-testid="superseded">
          This approval is superseded: the record was changed afterwards (version {s.superseded_by.version}), which is a new draft.
        </p>
      )}
      <ul className="mt-3 space-y-2" data-testid="signatures">
        {s.signatures.length === 0 && <li className="text-sm text-ink-500">No signatures yet.</li>}
        {s.signatures.map((g) => (
          <li key={g.id} className={`rounded-cell border px-3 py-2 text-sm ${g.void ? "border-fault-700 bg-fault-100" : "border-ink-100"}`}>
            <span className="font-semibold">{g.printed_name}</span> · <span className="uppercase tracking-wide">{g.meaning}</span> ·{" "}
            <span className="font-mono">{g.signed_at.replace("T", " ").slice(0, 19)} UTC</span>
            <span className="block break-all font-mono text-xs text-ink-500">signed content hash {g.content_hash}</span>
            {g.void && <span className="font-semibold text-fault-700">VOID: the record no longer matches what was signed.</span>}
          </li>
        ))}
      </ul>
      {s.events.length > 0 && (
        <ol className="mt-3 text-xs text-ink-500">
          {s.events.map((e, i) => (
            <li key={i}>
              {e.at.replace("T", " ").slice(0, 16)} UTC: {e.state} by {e.actor}
              {e.reason ? `: ${e.reason}` : ""}
            </li>
          ))}
        </ol>
      )}
      <div className="mt-5">
        <h3 className="text-sm font-semibold">Comments</h3>
        <ul className="mt-2 space-y-2 text-sm" data-testid="comments">
          {comments.data?.comments.map((c) => (
            <li key={c.id} className="rounded-cell bg-paper px-3 py-2">
              <span className="font-semibold">{c.author}</span> <span className="text-xs text-ink-500">{c.created_at.replace("T", " ").slice(0, 16)} UTC</span>
              <p className="whitespace-pre-wrap">{c.body}</p>
            </li>
          ))}
          {comments.data?.comments.length === 0 && <li className="text-ink-500">No comments.</li>}
        </ul>
        <CommentForm base={base} send={send} />
      </div>
      <SignDialog act={act} base={base} onClose={() => setAct(null)} send={send} />
    </section>
  );
}
