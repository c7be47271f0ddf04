// The method form's values (components/methods/method-form-values.ts): a saved definition comes back unchanged
// through the form, and the form's schema is the route's own (createMethodSchema / newMethodVersionSchema), so it
// refuses what the route refuses, with each issue on the form field it belongs to. Invented method (only the wiring).
import { describe, expect, it } from "vitest";
import { CRITERIA, formPath, methodBody, methodFormDefaults, methodFormSchema } from "@/components/methods/method-form-values";
import { createMethodSchema, methodDefinitionSchema } from "@/lib/schemas/methods";

const saved = methodDefinitionSchema.parse({
  name: "Blue fade, bench 2",
  analyte: "in-house blue",
  wavelength_nm: 590,
  path_length_cm: 1,
  concentration: { kind: "beer-lambert", epsilon: 87000 },
  blank: { kind: "value", value: 0.012 },
  models: ["first-order", "linearized", "formula"],
  weighting: "log",
  window: { from_s: 30, to_s: 1800 },
  custom_models: [{ name: "drifting baseline", formula: "a*exp(-k*t) + c + d*t", starts: { k: 0.002, a: 1 } }],
  criteria: [{ kind: "r2_min", value: 0.999 }, { kind: "rel_se_k_max", value: 0.02 }, { kind: "absorbance_window", min: 0.1, max: 1.2 }, { kind: "converged" }],
  notes: "Protect from light.",
});

describe("method form values", () => {
  it("a saved definition comes back unchanged through the form (SE(k)/k shown in %, stored as a fraction)", () => {
    const v = methodFormDefaults(saved, []);
    expect(v.definition.criteria[CRITERIA.findIndex((c) => c.kind === "rel_se_k_max")]).toEqual({ on: true, value: "2", min: "", max: "" });
    expect(createMethodSchema.parse(methodBody(v, false))).toEqual({ definition: saved });
  });

  it("a new method starts from defaults the route accepts once named", () => {
    const v = methodFormDefaults(undefined, [{ id: 4 }]);
    expect(v.definition.concentration.calibration_id).toBe("4");
    v.definition.name = "New method";
    v.definition.analyte = "dye";
    expect(methodFormSchema(false).safeParse(v).success).toBe(true);
  });

  it("refuses what the route refuses, each issue on its form field; a criterion by its place in the form", () => {
    const v = methodFormDefaults(saved, []);
    v.definition.window = { from_s: "600", to_s: "60" };
    v.definition.concentration.epsilon = "-5";
    const absorbance = CRITERIA.findIndex((c) => c.kind === "absorbance_window");
    v.definition.criteria[absorbance] = { on: true, value: "", min: "1.5", max: "0.2" };
    const r = methodFormSchema(false).safeParse(v);
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => formPath(i.path.join("."), v));
    expect(paths).toContain("definition.window");
    expect(paths).toContain("definition.concentration.epsilon");
    // The absorbance window is the third ticked criterion in the body, and the fifth criterion of the form.
    expect(paths).toContain(`definition.criteria.${absorbance}`);
    expect(methodFormSchema(false).safeParse(v).error!.issues.find((i) => i.path.join(".") === "definition.criteria.2")!.message).toMatch(/upper limit must be above/);
  });

  it("a new version needs its reason", () => {
    const v = methodFormDefaults(saved, []);
    expect(methodFormSchema(true).safeParse(v).success).toBe(false);
    v.reason = "window moved";
    expect(methodFormSchema(true).safeParse(v).success).toBe(true);
  });
});
