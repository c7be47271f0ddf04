"use client";
// Instrument API keys: created (shown once), listed with their last use, revoked.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { Table, Td, Th } from "@/components/ui/table";
import { useToast } from "@/components/ui/toast";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { problemText, sendJson } from "@/lib/http/client";
import { createApiKeySchema } from "@/lib/schemas/admin";
import type { ApiKeyMade } from "@/lib/schemas/responses";

interface Key {
  id: number;
  name: string;
  prefix: string;
  created_at: string;
  created_by: string | null;
  last_used_at: string | null;
  revoked_at: string | null;
}

export function ApiKeys({ keys }: { keys: Key[] }) {
  const router = useRouter();
  const toast = useToast();
  const [fresh, setFresh] = useState<{ name: string; key: string } | null>(null);
  const { register, handleSubmit, reset, formState } = useSchemaForm<{ name: string }, typeof createApiKeySchema>((v) => v, createApiKeySchema, { name: "" });
  const create = handleSubmit(async (body) => {
    let out: ApiKeyMade;
    try {
      out = await sendJson<ApiKeyMade>("/api/admin/api-keys", { body });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    setFresh({ name: out.name, key: out.key });
    reset({ name: "" });
    router.refresh();
  });
  async function revoke(id: number) {
    try {
      await sendJson(`/api/admin/api-keys/${id}`, { method: "DELETE" });
    } catch (e) {
      return toast(problemText(e), "fault");
    }
    toast("Key revoked: it no longer works.", "pass");
    router.refresh();
  }
  return (
    <>
      <form
        className="mb-6 flex max-w-2xl items-end gap-3 rounded-cell bg-paper-raised p-4 shadow-lift"
        onSubmit={create}
        noValidate
      >
        <div className="flex-1">
          <Input label="Instrument or PC" {...register("name")} error={fieldError(formState.errors, "name")} placeholder="Bench 2 spectrophotometer" required minLength={2} />
        </div>
        <Button type="submit" disabled={formState.isSubmitting}>
          Create key
        </Button>
      </form>
      {fresh && (
        <div className="mb-6 max-w-3xl rounded-cell border-l-4 border-quartz-700 bg-quartz-100 px-4 py-3 text-sm" role="status" data-testid="new-key">
          <p className="font-semibold">Key for {fresh.name}: copy it now, it is not shown again.</p>
          <p className="mt-1 break-all font-mono">{fresh.key}</p>
          <Button size="sm" variant="secondary" className="mt-2" onClick={() => navigator.clipboard?.writeText(fresh.key)}>
            Copy
          </Button>
        </div>
      )}
      <Table caption="Instrument API keys">
        <thead>
          <tr>
            <Th>Name</Th>
            <Th>Key starts</Th>
            <Th>Created</Th>
            <Th>Last used</Th>
            <Th>State</Th>
            <Th />
          </tr>
        </thead>
        <tbody>
          {keys.length === 0 ? (
            <tr>
              <Td colSpan={6} className="text-ink-500">No keys yet.</Td>
            </tr>
          ) : (
            keys.map((k) => (
              <tr key={k.id}>
                <Td className="font-semibold">{k.name}</Td>
                <Td className="font-mono">{k.prefix}…</Td>
                <Td>{k.created_at.slice(0, 16).replace("T", " ")} UTC by {k.created_by ?? "—"}</Td>
                <Td>{k.last_used_at ? `${k.last_used_at.slice(0, 16).replace("T", " ")} UTC` : "never"}</Td>
                <Td>{k.revoked_at ? <Badge tone="neutral">revoked {k.revoked_at.slice(0, 10)}</Badge> : <Badge tone="pass">active</Badge>}</Td>
                <Td>
                  {!k.revoked_at && (
                    <Button size="sm" variant="quiet" onClick={() => revoke(k.id)}>
                      Revoke
                    </Button>
                  )}
                </Td>
              </tr>
            ))
          )}
        </tbody>
      </Table>
    </>
  );
}
