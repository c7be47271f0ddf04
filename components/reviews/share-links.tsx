"use client";
// Share links for one record version: make one (optionally e-mailed), see how often each was opened, revoke.
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { fetcher } from "@/lib/http/fetcher";
import { problemText, sendJson } from "@/lib/http/client";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { createShareSchema } from "@/lib/schemas/sharing";
import type { ShareLinkMade } from "@/lib/schemas/responses";

interface LinkRow {
  id: number;
  recipient: string | null;
  expires_at: string;
  revoked_at: string | null;
  created_at: string;
  views: number;
}

export function ShareLinks({ record }: { record: { type: "fit" | "study"; id: number } }) {
  const toast = useToast();
  const base = `/api/${record.type === "fit" ? "fits" : "studies"}/${record.id}/share`;
  const links = useSWR<{ links: LinkRow[] }>(base, fetcher);
  const [made, setMade] = useState<string | null>(null);
  const { register, handleSubmit, reset, formState } = useSchemaForm<{ recipient: string }, typeof createShareSchema>((v) => ({ recipient: v.recipient.trim() || null }), createShareSchema, { recipient: "" });

  const make = handleSubmit(async (body) => {
    let out: ShareLinkMade;
    try {
      out = await sendJson<ShareLinkMade>(base, { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    setMade(out.url);
    reset({ recipient: "" });
    await links.mutate();
  });
  async function revoke(id: number) {
    try {
      await sendJson(`/api/share-links/${id}/revoke`);
    } catch (e) {
      return toast(`The link could not be revoked: ${problemText(e)}`, "fault");
    }
    toast("Link revoked.", "info");
    await links.mutate();
  }

  return (
    <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Share links">
      <h2 className="text-lg font-semibold">Share this version</h2>
      <p className="text-sm text-ink-500">A link opens exactly this version, read-only, for signed-in members of the lab, for 14 days. Only its hash is stored.</p>
      <form className="mt-3 flex flex-wrap items-end gap-2" onSubmit={make} noValidate>
        <div className="w-72">
          <Input label="E-mail it to (optional)" type="email" {...register("recipient")} error={fieldError(formState.errors, "recipient")} />
        </div>
        <Button type="submit" variant="secondary" disabled={formState.isSubmitting} data-testid="make-share">
          Make a link
        </Button>
      </form>
      {made && (
        <p className="mt-2 break-all rounded-cell bg-quartz-100 px-3 py-2 font-mono text-xs" data-testid="share-url">
          {made}
        </p>
      )}
      {links.error && <p className="mt-2 text-sm text-fault-700">The links could not be loaded: {links.error.message}</p>}
      <ul className="mt-3 space-y-1 text-sm">
        {links.data?.links.map((l) => (
          <li key={l.id} className="flex flex-wrap items-center gap-2">
            <span className="min-w-0 break-words">
              Link {l.id}
              {l.recipient ? ` to ${l.recipient}` : ""} · made {l.created_at.slice(0, 10)} · {l.revoked_at ? `revoked ${l.revoked_at.slice(0, 10)}` : `expires ${l.expires_at.slice(0, 10)}`} · opened {l.views}×
            </span>
            {!l.revoked_at && (
              <button type="button" className="text-quartz-700 underline" onClick={() => revoke(l.id)}>
                revoke
              </button>
            )}
          </li>
        ))}
      </ul>
    </section>
  );
}
