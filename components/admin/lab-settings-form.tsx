"use client";
// The lab's settings, changed with a reason (audited with old and new values).
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { problemLines, sendJson } from "@/lib/http/client";

export function LabSettingsForm({ initial }: { initial: { outside_links: boolean; default_link_days: number; upload_limit_mb: number; password_min_length: number } }) {
  const router = useRouter();
  const toast = useToast();
  const [outside, setOutside] = useState(initial.outside_links);
  const [days, setDays] = useState(String(initial.default_link_days));
  const [upload, setUpload] = useState(String(initial.upload_limit_mb));
  const [pw, setPw] = useState(String(initial.password_min_length));
  const [reason, setReason] = useState("");
  const [errors, setErrors] = useState<string[]>([]);
  async function save() {
    setErrors([]);
    try {
      await sendJson("/api/admin/settings", { method: "PUT", body: { outside_links: outside, default_link_days: Number(days), upload_limit_mb: Number(upload), password_min_length: Number(pw), reason } });
    } catch (e) {
      setErrors(problemLines(e));
      return;
    }
    toast("Settings saved, and written to the audit trail.", "pass");
    setReason("");
    router.refresh();
  }
  return (
    <form
      className="max-w-2xl space-y-4 rounded-cell bg-paper-raised p-5 shadow-lift"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" checked={outside} onChange={(e) => setOutside(e.target.checked)} className="mt-1" />
        <span>
          <span className="font-semibold">Share links may be sent to outside reviewers</span>
          <span className="block text-ink-500">On: a link may be mailed to someone outside the lab, who opens that one pinned version read-only without an account. Off: links go to members only, who sign in to open them. Every opening is logged.</span>
        </span>
      </label>
      <div className="grid gap-4 sm:grid-cols-3">
        <Input label="Share links expire after (days)" inputMode="numeric" value={days} onChange={(e) => setDays(e.target.value)} />
        <Input label="Upload limit (MB per file)" inputMode="numeric" value={upload} onChange={(e) => setUpload(e.target.value)} hint="At most 50 MB, the server's own limit." />
        <Input label="Passwords at least (characters)" inputMode="numeric" value={pw} onChange={(e) => setPw(e.target.value)} hint="10 or more; never the e-mail address." />
      </div>
      <Input label="Why this change (required)" value={reason} onChange={(e) => setReason(e.target.value)} required minLength={3} />
      {errors.length > 0 && (
        <ul role="alert" className="list-disc pl-5 text-sm text-fault-700">
          {errors.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      )}
      <Button type="submit" disabled={reason.trim().length < 3}>
        Save settings
      </Button>
    </form>
  );
}
