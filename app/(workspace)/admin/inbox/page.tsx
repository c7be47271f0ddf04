import type { Metadata } from "next";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { requirePageUser } from "@/lib/auth/page";
import { readSinkInbox } from "@/lib/mail/inbox";

export const metadata: Metadata = { title: "Demo inbox" };

// The local mail sink's messages, for the demo: what reviewers and authors would have received.
export default async function InboxPage() {
  await requirePageUser("user:manage", "/admin/inbox");
  const mails = await readSinkInbox();
  return (
    <>
      <PageHeader title="Demo inbox" lede="Messages caught by the local mail sink that `npm run demo` starts (no mail leaves this machine)." />
      {mails === null ? (
        <EmptyState title="No mail sink here">This server sends mail through SMTP_URL; messages are not kept here.</EmptyState>
      ) : mails.length === 0 ? (
        <EmptyState title="No mail yet">Submitting a fit for review, a decision, a comment or a share link with a recipient sends one.</EmptyState>
      ) : (
        <ul className="space-y-3">
          {mails.map((m) => (
            <li key={m.file} className="rounded-cell bg-paper-raised p-4 shadow-lift">
              <p className="font-semibold">{m.subject}</p>
              <p className="text-sm text-ink-500">
                To {m.to} · {m.date.replace("T", " ").slice(0, 16)} UTC
              </p>
              <pre className="mt-2 whitespace-pre-wrap font-sans text-sm">{m.text}</pre>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
