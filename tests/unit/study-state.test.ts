// A study page's edits (components/studies/study-state.ts): each action, and the body of a new version as the route's
// own schema (changeStudySchema) parses it. The prediction and band are the engine's own functions, checked against
// references in tests/unit/kinetics; here only that the page calls them with the study's members.
import { describe, expect, it } from "vitest";
import { initialStudyEdits, studyChangeBody, studyEditReducer, studyPrediction, temperatureChanged } from "@/components/studies/study-state";
import { celsiusToKelvin, predictRateConstant } from "@/lib/kinetics/temperature";
import { changeStudySchema } from "@/lib/schemas/studies";

// Invented members: k from Ea = 82 kJ/mol (as the demo's), only the wiring is checked.
const member = (fitId: number, c: number, extra: Record<string, unknown> = {}) => ({
  fitId,
  temperature_used_c: c,
  temperature_c: null,
  temperature_reason: null,
  k: 1e-3 * Math.exp((-82000 / 8.314462618) * (1 / celsiusToKelvin(c) - 1 / 298.15)),
  se: 2e-5,
  ...extra,
});
const study = { name: "Blue fade", options: { weighted: true, target_c: 25 }, members: [member(11, 25), member(12, 30), member(13, 40, { temperature_c: 40, temperature_reason: "bath logged 40.0 °C" }), member(14, 50)] };

describe("study edits", () => {
  it("start from the study's name and target", () => {
    expect(initialStudyEdits(study as never)).toMatchObject({ name: "Blue fade", target: "25", temps: {}, removed: [] });
  });

  it("a changed temperature with its reason, one fit left out, one added by its label: the route accepts the body", () => {
    let e = initialStudyEdits(study as never);
    e = studyEditReducer(e, { type: "temperature", fitId: 12, value: "30,5" });
    e = studyEditReducer(e, { type: "reason", fitId: 12, value: "probe read 30.5 °C" });
    e = studyEditReducer(e, { type: "leave-out", fitId: 14, out: true });
    e = studyEditReducer(e, { type: "leave-out", fitId: 14, out: true });
    e = studyEditReducer(e, { type: "set", field: "added", value: "Blue 35 °C v1" });
    e = studyEditReducer(e, { type: "set", field: "why", value: "corrected bath temperature" });
    expect(temperatureChanged(e, study.members[1]!)).toBe(true);
    expect(temperatureChanged(e, study.members[0]!)).toBe(false);
    const body = changeStudySchema.parse(studyChangeBody(study as never, e, [{ id: 21, label: "Blue 35 °C v1" }]));
    expect(body.members).toEqual([
      { fitId: 11 },
      { fitId: 12, temperature_c: 30.5, temperature_reason: "probe read 30.5 °C" },
      { fitId: 13, temperature_c: 40, temperature_reason: "bath logged 40.0 °C" },
      { fitId: 21 },
    ]);
    expect(body).toMatchObject({ reason: "corrected bath temperature", name: "Blue fade", options: { weighted: true, target_c: 25 } });
    // Putting the fit back in.
    expect(studyEditReducer(e, { type: "leave-out", fitId: 14, out: false }).removed).toEqual([]);
  });

  it("the prediction is the engine's, from the members at the target temperature", () => {
    const p = studyPrediction(study as never, true, "20");
    const points = study.members.map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c), k: m.k, se: m.se }));
    expect(p!.k).toBe(predictRateConstant(points, celsiusToKelvin(20)).k);
    expect(studyPrediction(study as never, true, "")).toBeNull();
    expect(studyPrediction(study as never, true, "abc")).toBeNull();
  });
});
