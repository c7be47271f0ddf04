"use client";
// The run's method and how the current fit stands against its acceptance criteria.
import { Badge } from "@/components/ui/badge";
import type { evaluateCriteria } from "@/lib/kinetics/criteria";
import type { MethodForRun } from "@/lib/schemas/methods";

export function CriteriaPanel({ method, verdict }: { method: MethodForRun; verdict: ReturnType<typeof evaluateCriteria> }) {
  return (
    <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Method criteria" data-testid="criteria-panel">
      <h2 className="text-sm font-semibold">
        Method: {method.name} <span className="font-normal text-ink-500">v{method.version}</span>
      </h2>
      {method.criteria.length === 0 ? (
        <p className="mt-1 text-sm text-ink-500">The method sets no acceptance criteria.</p>
      ) : (
        <>
          <p className="mt-1 text-sm">
            {verdict.passed ? <Badge tone="pass">all {verdict.results.length} criteria met</Badge> : <Badge tone="fault">{verdict.failed} of {verdict.results.length} not met</Badge>}{" "}
            <span className="text-ink-500">judging {verdict.model}</span>
          </p>
          <ul className="mt-2 space-y-1 text-sm">
            {verdict.results.map((r) => (
              <li key={r.kind} className="flex items-start justify-between gap-2" data-criterion={r.kind} data-pass={r.pass}>
                <span>
                  {r.label}
                  {r.note && <span className="block text-xs text-ink-500">{r.note}</span>}
                </span>
                <span className="num whitespace-nowrap font-mono text-xs">
                  {r.observed ?? "—"} {r.pass ? <Badge tone="pass">pass</Badge> : <Badge tone="fault">fail</Badge>}
                </span>
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
