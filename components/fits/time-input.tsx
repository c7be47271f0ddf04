"use client";
import { useState } from "react";
import { Input } from "@/components/ui/field";
import { parseDecimalField } from "@/lib/format/input";

/**
 * A time entered in the page's own time unit (minutes when the page shows minutes) and kept in seconds: what is typed
 * stays as typed while the field has focus; the options get seconds.
 */
export function TimeInput({ label, seconds, scale, hint, onSeconds }: { label: string; seconds: string; scale: number; hint?: string; onSeconds: (s: string) => void }) {
  const [draft, setDraft] = useState<string | null>(null);
  const sec = parseDecimalField(seconds);
  const shown = draft ?? (sec === null ? "" : String(Number((sec / scale).toPrecision(10))));
  return (
    <Input
      label={`${label} (${scale === 60 ? "min" : "s"})`}
      inputMode="decimal"
      value={shown}
      hint={hint}
      onFocus={() => setDraft(shown)}
      onBlur={() => setDraft(null)}
      onChange={(e) => {
        setDraft(e.target.value);
        const v = parseDecimalField(e.target.value);
        onSeconds(v === null ? "" : String(Number((v * scale).toPrecision(12))));
      }}
    />
  );
}
