"use client";
// Calibration curves: standards entered as a table (typed, pasted from a spreadsheet, or read from an exported file),
// the line through them with its uncertainties, the residual plot, LOD/LOQ with the σ chosen, the linearity check,
// and inverse prediction of a concentration with its SE. The browser calls the same engine the server runs on save.
// State and the step to the line: calibration-state.ts (unit-tested); views: the files beside this one.
import { useRouter } from "next/navigation";
import { useMemo, useReducer, useState } from "react";
import { Button } from "@/components/ui/button";
import { useToast } from "@/components/ui/toast";
import { problemText, sendJson } from "@/lib/http/client";
import { CalibrationEntry } from "./calibration-entry";
import { CalibrationPlots } from "./calibration-plots";
import { CalibrationResult } from "./calibration-result";
import { calibrationBody, calibrationReducer, computeCalibration, initialCalibrationState, type SavedCalibration } from "./calibration-state";
import type { Created } from "@/lib/schemas/responses";

export function CalibrationWorkbench({ saved, canSave }: { saved?: SavedCalibration; canSave: boolean }) {
  const router = useRouter();
  const toast = useToast();
  const readOnly = Boolean(saved);
  const [s, dispatch] = useReducer(calibrationReducer, saved, initialCalibrationState);
  const [saving, setSaving] = useState(false);
  const { standards, result, cal, prediction } = useMemo(() => computeCalibration(s), [s]);

  async function save() {
    setSaving(true);
    let body: Created;
    try {
      body = await sendJson<Created>("/api/calibrations", { body: calibrationBody(s, standards) });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    } finally {
      setSaving(false);
    }
    toast("Calibration saved.", "pass");
    router.push(`/methods/calibrations/${body.id}`);
  }

  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_24rem]">
      <div className="min-w-0 space-y-6">
        <CalibrationPlots standards={standards} cal={cal} unit={s.unit} />
        <CalibrationResult result={result} prediction={prediction} unit={s.unit} readings={s.readings} onReadings={(v) => dispatch({ type: "set", field: "readings", value: v })} />
      </div>

      <aside className="space-y-5" aria-label="Calibration entry">
        <CalibrationEntry state={s} dispatch={dispatch} readOnly={readOnly} count={standards.length} />
        {!readOnly && canSave && (
          <Button className="w-full" onClick={save} disabled={saving || !cal || s.name.trim().length < 2 || !s.analyte.trim()} data-testid="save-calibration">
            {saving ? "Saving…" : "Save calibration"}
          </Button>
        )}
      </aside>
    </div>
  );
}
