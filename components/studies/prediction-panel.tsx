"use client";
// k, t½ and t90 at a target temperature from the study's Arrhenius line, with the 95 % prediction interval, the
// extrapolation warning and the caution every prediction carries.
import { Input } from "@/components/ui/field";
import { formatNumber, formatSeconds } from "@/lib/format/number";
import { PREDICTION_CAUTION } from "@/lib/studies/caution";
import type { studyPrediction } from "./study-state";

export function PredictionPanel({ target, onTarget, prediction }: { target: string; onTarget: (v: string) => void; prediction: ReturnType<typeof studyPrediction> }) {
  return (
    <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Prediction">
      <h2 className="mb-3 text-lg font-semibold">Prediction at a temperature</h2>
      <div className="flex flex-wrap items-end gap-4">
        <div className="w-48">
          <Input label="Target temperature (°C)" inputMode="decimal" value={target} onChange={(e) => onTarget(e.target.value)} />
        </div>
        {prediction && (
          <div className="num font-mono text-sm" data-testid="prediction">
            <p>
              k = {formatNumber(prediction.k, 4)} s⁻¹ (95 % prediction interval {formatNumber(prediction.pi95[0], 3)} … {formatNumber(prediction.pi95[1], 3)})
            </p>
            <p>
              t½ = {formatSeconds(prediction.half)} · t90 = {formatSeconds(prediction.t90)} (95 % PI {formatSeconds(prediction.t90pi[0])} … {formatSeconds(prediction.t90pi[1])})
            </p>
          </div>
        )}
      </div>
      {prediction?.warning && (
        <p className="mt-3 rounded-cell border-l-4 border-caution-700 bg-caution-100 px-3 py-2 text-sm text-caution-700" data-testid="extrapolation">
          {prediction.warning}
        </p>
      )}
      <p className="mt-3 text-sm text-ink-700" data-testid="caution">
        Caution: {PREDICTION_CAUTION.charAt(0).toLowerCase() + PREDICTION_CAUTION.slice(1)}
      </p>
    </section>
  );
}
