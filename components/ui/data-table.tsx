"use client";
// The one table for long server-side lists (methods, calibrations, lab members): TanStack Table for the column model
// and header state, with sorting, filtering and paging done by the server. The state lives in the page's URL
// (?q=&sort=&dir=&page=), so a list can be linked, reloaded and navigated back to.
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from "@tanstack/react-table";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useState, useTransition } from "react";
import { Button } from "./button";
import { cn } from "./cn";

export interface ServerListState {
  total: number;
  page: number;
  pageSize: number;
  sort: string;
  dir: "asc" | "desc";
  q?: string;
}

export type DataColumn<T> = ColumnDef<T> & { meta?: { numeric?: boolean } };

export function DataTable<T>({
  caption,
  columns,
  rows,
  state,
  searchLabel,
  empty,
  rowTestId,
}: {
  caption: string;
  columns: DataColumn<T>[];
  rows: T[];
  state: ServerListState;
  searchLabel: string;
  empty: React.ReactNode;
  rowTestId?: (row: T) => string;
}) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const [pending, startTransition] = useTransition();
  const [q, setQ] = useState(state.q ?? "");
  const go = (change: Record<string, string | null>) => {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(change)) {
      if (v === null || v === "") next.delete(k);
      else next.set(k, v);
    }
    startTransition(() => router.push(`${pathname}?${next}`, { scroll: false }));
  };
  const sorting: SortingState = [{ id: state.sort, desc: state.dir === "desc" }];
  // TanStack Table's instance is mutable by design, so the React Compiler leaves this component unmemoized (as it should).
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: rows,
    // Sorting happens on the server, but TanStack only offers it on columns with an accessor: give sortable ones a stub.
    columns: columns.map((c) => (c.enableSorting === false || "accessorFn" in c ? c : { ...c, accessorFn: () => null })) as DataColumn<T>[],
    state: { sorting },
    manualSorting: true,
    // One column is always sorted; a click turns it ascending first, then the other way.
    enableSortingRemoval: false,
    sortDescFirst: false,
    manualPagination: true,
    manualFiltering: true,
    rowCount: state.total,
    getCoreRowModel: getCoreRowModel(),
    onSortingChange: (updater) => {
      const s = typeof updater === "function" ? updater(sorting) : updater;
      const first = s[0];
      go({ sort: first?.id ?? null, dir: first ? (first.desc ? "desc" : "asc") : null, page: null });
    },
  });
  const pages = Math.max(1, Math.ceil(state.total / state.pageSize));
  return (
    <section aria-label={caption} aria-busy={pending}>
      <form
        className="mb-3 flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          go({ q, page: null });
        }}
      >
        <label className="text-sm">
          <span className="block font-semibold text-ink-700">{searchLabel}</span>
          <input value={q} onChange={(e) => setQ(e.target.value)} className="mt-1 h-9 w-64 rounded-cell border border-ink-300 bg-paper-raised px-3" />
        </label>
        <Button type="submit" variant="secondary" size="sm">
          Search
        </Button>
        {state.q && (
          <Button variant="quiet" size="sm" onClick={() => { setQ(""); go({ q: null, page: null }); }}>
            Clear
          </Button>
        )}
        <p className="ml-auto text-sm text-ink-500" aria-live="polite">
          {state.total} in all{pending ? " · loading…" : ""}
        </p>
      </form>
      <div className={cn("relative overflow-x-auto rounded-cell border border-ink-100 bg-paper-raised", pending && "opacity-70")}>
        <table className="w-full border-collapse text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const numeric = (h.column.columnDef as DataColumn<T>).meta?.numeric;
                  const sorted = h.column.getIsSorted();
                  return (
                    <th
                      key={h.id}
                      scope="col"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                      className={cn("border-b border-ink-100 bg-paper-sunk px-3 py-2 text-left text-sm font-semibold text-ink-700", numeric && "text-right")}
                    >
                      {h.column.getCanSort() ? (
                        <button type="button" className="inline-flex items-center gap-1 hover:text-quartz-700" onClick={h.column.getToggleSortingHandler()}>
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden className="text-xs text-ink-500">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-500">
                  {state.q ? `Nothing matches “${state.q}”.` : empty}
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((r) => (
                <tr key={r.id} data-testid={rowTestId?.(r.original)}>
                  {r.getVisibleCells().map((c) => (
                    <td key={c.id} className={cn("border-b border-ink-100 px-3 py-2 align-top", (c.column.columnDef as DataColumn<T>).meta?.numeric && "num whitespace-nowrap text-right font-mono")}>
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      {pages > 1 && (
        <nav className="mt-3 flex items-center gap-2 text-sm" aria-label={`${caption}: pages`}>
          <Button size="sm" variant="secondary" disabled={state.page <= 1} onClick={() => go({ page: String(state.page - 1) })}>
            Previous
          </Button>
          <span>
            Page {state.page} of {pages}
          </span>
          <Button size="sm" variant="secondary" disabled={state.page >= pages} onClick={() => go({ page: String(state.page + 1) })}>
            Next
          </Button>
        </nav>
      )}
    </section>
  );
}
