// What a list page shows while the server reads it: the header's place and a few grey rows, announced as loading.
export function ListSkeleton({ label }: { label: string }) {
  return (
    <div aria-busy="true" aria-label={label} role="status" className="space-y-4" data-testid="list-skeleton">
      <div className="h-8 w-64 animate-pulse rounded-cell bg-paper-sunk" />
      <div className="h-4 w-96 max-w-full animate-pulse rounded-cell bg-paper-sunk" />
      <div className="space-y-2 pt-4">
        {Array.from({ length: 6 }, (_, i) => (
          <div key={i} className="h-10 animate-pulse rounded-cell bg-paper-sunk" />
        ))}
      </div>
      <span className="sr-only">{label}…</span>
    </div>
  );
}
