import type { ReactNode } from "react";

export function PageHeader({ title, lede, actions }: { title: string; lede?: string; actions?: ReactNode }) {
  return (
    <header className="mb-8 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {lede && <p className="mt-1 max-w-prose text-base text-ink-700">{lede}</p>}
      </div>
      {actions}
    </header>
  );
}
