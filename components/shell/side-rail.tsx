"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { signOut } from "next-auth/react";
import { cn } from "@/components/ui/cn";
import { Mark } from "./mark";

export function SideRail({
  areas,
  lab,
  person,
}: {
  areas: Array<{ href: string; label: string; count?: number }>;
  lab: string;
  person: { name: string; role: string; email: string };
}) {
  const path = usePathname();
  return (
    // A rail on the left from tablet width up; above the page, its links wrapping, on a phone.
    <aside data-print="hide" className="flex w-full shrink-0 flex-col border-b border-ink-100 bg-paper-sunk md:w-rail md:border-b-0 md:border-r">
      <a href="#main" className="sr-only focus:not-sr-only focus:m-2 focus:rounded-cell focus:bg-paper-raised focus:p-2">
        Skip to content
      </a>
      <div className="flex items-center gap-3 px-5 py-3 md:py-5">
        <Mark size={30} />
        <div className="min-w-0">
          <p className="font-semibold leading-tight">Halflight</p>
          <p className="truncate text-xs text-ink-500" title={lab}>
            {lab}
          </p>
        </div>
      </div>
      <nav aria-label="Workspace" className="flex-1 px-3">
        <ul className="flex flex-wrap gap-1 md:flex-col md:gap-0.5" data-testid="workspace-nav">
          {areas.map((a) => {
            const active = path === a.href || path.startsWith(a.href + "/");
            return (
              <li key={a.href}>
                <Link
                  href={a.href}
                  aria-current={active ? "page" : undefined}
                  className={cn(
                    "block rounded-cell px-3 py-2 text-base",
                    active ? "bg-paper-raised font-semibold text-quartz-700 shadow-lift" : "text-ink-700 hover:bg-paper-raised",
                  )}
                >
                  {a.label}
                  {a.count !== undefined && (
                    <span className="ml-2 inline-flex min-w-6 justify-center rounded-full bg-quartz-700 px-1.5 text-xs font-semibold text-white" data-testid={`count-${a.href.slice(1)}`} aria-label={`${a.count} waiting for you`}>
                      {a.count}
                    </span>
                  )}
                </Link>
              </li>
            );
          })}
        </ul>
      </nav>
      <div className="flex items-baseline gap-x-3 border-t border-ink-100 px-5 py-2 text-sm md:block md:py-4">
        <p className="font-semibold" data-testid="signed-in-name">
          {person.name}
        </p>
        <p className="text-ink-500" data-testid="signed-in-role">
          {person.role}
        </p>
        <button
          type="button"
          onClick={() => signOut({ callbackUrl: "/sign-in" })}
          className="text-sm font-semibold text-quartz-700 underline-offset-2 hover:underline md:mt-3"
        >
          Sign out
        </button>
      </div>
    </aside>
  );
}
