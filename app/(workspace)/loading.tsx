// Shown while a workspace page is rendered on the server (a big run, a long audit trail): the shape of a page, not a
// blank screen.
export default function WorkspaceLoading() {
  return (
    <div className="space-y-4" aria-busy="true" aria-label="Loading the page">
      <div className="h-8 w-64 animate-pulse rounded-cell bg-paper-sunk" />
      <div className="h-4 w-96 max-w-full animate-pulse rounded-cell bg-paper-sunk" />
      <div className="h-64 animate-pulse rounded-cell bg-paper-sunk" />
      <div className="h-40 animate-pulse rounded-cell bg-paper-sunk" />
    </div>
  );
}
