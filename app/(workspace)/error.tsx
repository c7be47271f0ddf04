"use client";
// A workspace page that failed to render: what happened in plain words, a way to try again, and the reference the
// server logged (never the stack). The rest of the workspace (navigation) stays usable.
import { useEffect } from "react";
import { Button } from "@/components/ui/button";

export default function WorkspaceError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <section role="alert" className="max-w-2xl rounded-cell bg-fault-100 p-5 text-fault-700" data-testid="page-error">
      <h1 className="text-lg font-semibold">This page could not be shown</h1>
      <p className="mt-1 text-sm">
        Nothing was changed by this. Try again; if it keeps happening, tell the lab administrator
        {error.digest ? (
          <>
            {" "}
            and give them the reference <span className="font-mono">{error.digest}</span>
          </>
        ) : null}
        .
      </p>
      <Button className="mt-3" variant="secondary" onClick={reset}>
        Try again
      </Button>
    </section>
  );
}
