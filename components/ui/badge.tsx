// A small state label: colour and words together, never colour alone.
import type { ReactNode } from "react";
import { cn } from "./cn";

const TONES = {
  neutral: "bg-ink-100 text-ink-900",
  accent: "bg-quartz-100 text-quartz-700",
  pass: "bg-pass-100 text-pass-700",
  caution: "bg-caution-100 text-caution-700",
  fault: "bg-fault-100 text-fault-700",
} as const;

export function Badge({ tone = "neutral", children }: { tone?: keyof typeof TONES; children: ReactNode }) {
  return (
    <span className={cn("inline-flex items-center rounded-full px-2 py-0.5 text-xs font-semibold", TONES[tone])}>
      {children}
    </span>
  );
}
