// The signed-out pages' frame (invitation, first run): the product's mark and name above one card.
import type { ReactNode } from "react";
import { Mark } from "@/components/shell/mark";

export function AuthCard({ title, lede, children, footer }: { title: ReactNode; lede: ReactNode; children: ReactNode; footer?: ReactNode }) {
  return (
    <main className="grid min-h-screen place-items-center px-4 py-10">
      <div className="w-full max-w-md">
        <div className="mb-8 flex items-center gap-3">
          <Mark />
          <p className="text-xl font-semibold tracking-tight">Halflight</p>
        </div>
        <div className="rounded-cell bg-paper-raised p-6 shadow-lift">
          <h1 className="text-lg font-semibold">{title}</h1>
          <p className="mb-5 mt-1 text-sm text-ink-700">{lede}</p>
          {children}
        </div>
        {footer}
      </div>
    </main>
  );
}
