// What a page shows before it has anything: what will live here, and what to do first.
import type { ReactNode } from "react";

export function EmptyState({ title, children, action }: { title: string; children: ReactNode; action?: ReactNode }) {
  return (
    <section className="rounded-cell border border-dashed border-ink-300 bg-paper-raised px-8 py-10 text-center">
      <h2 className="text-lg font-semibold text-ink-900">{title}</h2>
      <div className="mx-auto mt-2 max-w-prose text-base text-ink-700">{children}</div>
      {action && <div className="mt-5 flex justify-center">{action}</div>}
    </section>
  );
}
