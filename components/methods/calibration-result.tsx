"use client";
// The line through the standards: slope and intercept with SEs, r², residual SD, LOD and LOQ with the σ used, the
// linearity check, and the concentration of an unknown from its readings.
import { Badge } from "@/components/ui/badge";
import { Input } from "@/components/ui/field";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import type { Calibration } from "@/lib/kinetics/quantities";

export function CalibrationResult({ result, prediction, unit, readings, onReadings }: {
  result: { cal: Calibration } | { error: string } | null;
  prediction: { value: number; se: number; m: number } | null;
  unit: string;
  readings: string;
  onReadings: (v: string) => void;
}) {
  return (
    <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Calibration result" data-testid="calibration-result">
      <h2 className="mb-3 text-lg font-semibold">Line</h2>
      {!result ? (
        <p className="text-sm text-ink-500">Enter at least three standards.</p>
      ) : "error" in result ? (
        <p role="alert" className="text-sm text-fault-700">{result.error}</p>
      ) : (
        <>
          <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm md:grid-cols-3">
            <Stat label={`Slope (AU per ${unit})`} value={formatWithUncertainty(result.cal.slope, result.cal.seSlope)} testId="cal-slope" />
            <Stat label="Intercept (AU)" value={result.cal.throughOrigin ? "0 (through the origin)" : formatWithUncertainty(result.cal.intercept, result.cal.seIntercept)} testId="cal-intercept" />
            <Stat label="r²" value={result.cal.r2.toFixed(6)} />
            <Stat label="Residual SD (AU)" value={formatNumber(result.cal.residualSd, 4)} />
            <Stat label={`LOD = 3.3σ/S (${unit})`} value={formatNumber(result.cal.lod, 4)} testId="cal-lod" />
            <Stat label={`LOQ = 10σ/S (${unit})`} value={formatNumber(result.cal.loq, 4)} testId="cal-loq" />
            <Stat label="σ used" value={`${formatNumber(result.cal.sigma, 4)} AU (${{ residual: "residual SD", intercept: "SE of the intercept", blank: "SD of blanks" }[result.cal.sigmaSource]})`} />
            <Stat label="Standards / levels" value={`${result.cal.n} / ${result.cal.levels}`} />
            <Stat label="Range" value={`${formatNumber(result.cal.range[0], 4)} to ${formatNumber(result.cal.range[1], 4)} ${unit}`} />
          </dl>
          <p className="mt-3 text-sm">
            Linearity:{" "}
            {result.cal.linearity.linear ? <Badge tone="pass">no curvature or outlying standard found</Badge> : <Badge tone="caution">check the range</Badge>}{" "}
            {result.cal.linearity.quadratic && <span className="text-ink-500">quadratic term F = {result.cal.linearity.quadratic.f.toFixed(2)}, p = {result.cal.linearity.quadratic.p.toPrecision(2)} (Mandel)</span>}
          </p>
          {result.cal.warnings.map((w) => (
            <p key={w} className="mt-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">{w}</p>
          ))}
          <div className="mt-4 max-w-md">
            <Input label="Readings of an unknown (AU, replicates separated by spaces)" value={readings} onChange={(e) => onReadings(e.target.value)} inputMode="decimal" />
            {prediction && (
              <p className="num mt-1 text-sm" data-testid="cal-predict">
                c = {formatWithUncertainty(prediction.value, prediction.se)} {unit} from {prediction.m} reading{prediction.m === 1 ? "" : "s"}
                {prediction.value < result.cal.loq ? " · below the LOQ: report as not quantifiable" : prediction.value > result.cal.range[1] ? " · above the highest standard: dilute and measure again" : ""}
              </p>
            )}
          </div>
          <p className="mt-4 text-xs text-ink-500">LOD and LOQ follow ICH Q2(R2) (3.3σ/S and 10σ/S) with the σ shown. Whether a curve is fit for a release or stability decision is for qualified review under your lab&apos;s SOPs and local regulations.</p>
        </>
      )}
    </section>
  );
}

function Stat({ label, value, testId }: { label: string; value: string; testId?: string }) {
  return (
    <div>
      <dt className="text-xs text-ink-500">{label}</dt>
      <dd className="num font-mono" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}
