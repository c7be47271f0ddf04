import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "./page-header";

/** An area whose feature has not landed yet: it says what will live here, and that it is not built. */
export function AreaPlaceholder({ title, purpose, missing }: { title: string; purpose: string; missing: string }) {
  return (
    <>
      <PageHeader title={title} />
      <EmptyState title={`Nothing here yet`}>
        <p>{purpose}</p>
        <p className="mt-3 text-sm text-ink-500">Not built yet: {missing}</p>
      </EmptyState>
    </>
  );
}
