import type { Metadata } from "next";
import { ApiKeys } from "@/components/admin/api-keys";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { listApiKeys } from "@/lib/admin/api-keys";
import { RATE_RULES } from "@/lib/http/rate-limit";
import { requirePageUser } from "@/lib/auth/page";
import { appUrl } from "@/lib/mail";

export const metadata: Metadata = { title: "Instrument keys" };

export default async function ApiKeysPage() {
  const user = await requirePageUser("user:manage", "/admin/api-keys");
  const keys = await listApiKeys(await getDb(), user.labId);
  return (
    <>
      <PageHeader title="Instrument keys" lede={`Keys let an instrument PC push exports into ${user.labName} without a person signing in. Each key writes only into this lab; keys are stored hashed and can be revoked at any time.`} />
      <ApiKeys keys={keys} />
      <section className="mt-8 max-w-3xl text-sm">
        <h2 className="mb-2 text-lg font-semibold">Sending a file</h2>
        <pre className="overflow-x-auto rounded-cell bg-ink-900 p-4 font-mono text-xs text-paper">{`curl -H "Authorization: Bearer <key>" \\
  -F file=@run-0412.csv \\
  -F 'metadata={"temperature_c": 30, "operator": "bench 2"}' \\
  ${appUrl("/api/ingest")}`}</pre>
        <p className="mt-2 text-ink-700">The answer is the run id (201), the existing run for a file sent before (200), or a message naming the line of a file that cannot be read (422, nothing stored). At most {RATE_RULES.apiKeyRequests.points} requests a minute per key; an address that sends {RATE_RULES.apiKeyFailuresByAddress.points} refused keys in {RATE_RULES.apiKeyFailuresByAddress.duration / 60} minutes waits out the rest of that time.</p>
      </section>
    </>
  );
}
