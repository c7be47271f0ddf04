// Methods (how a run must be evaluated), calibrations (standards and their line), and the list query both share.
import { z } from "zod";
import type { Criterion } from "@/lib/kinetics/criteria";
import type { Conversion } from "@/lib/kinetics/workspace";
import { DEFAULT_METHOD_MODELS } from "@/lib/kinetics/models";
import { lineText } from "./common";
import { FIT_MODELS } from "./fits";

const reason = z.string().trim().min(3, "Say why (at least 3 characters).").max(1000);
const positive = z.number().finite().positive();

export const criterionSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("r2_min"), value: z.number().finite().min(0).max(1) }),
  z.strictObject({ kind: z.literal("runs_z_max"), value: positive }),
  z.strictObject({ kind: z.literal("rel_se_k_max"), value: positive.max(10) }),
  z.strictObject({ kind: z.literal("min_points"), value: z.number().int().min(3).max(10_000_000) }),
  z.strictObject({ kind: z.literal("absorbance_window"), min: z.number().finite(), max: z.number().finite() }).refine((c) => c.max > c.min, "The window's upper limit must be above its lower limit."),
  z.strictObject({ kind: z.literal("converged") }),
]) satisfies z.ZodType<Criterion>;

export const customModelSchema = z.strictObject({
  name: lineText(80).pipe(z.string().min(1)),
  formula: z.string().trim().min(1).max(500),
  starts: z
    .record(z.string().regex(/^[A-Za-z][A-Za-z0-9_]{0,31}$/, "A parameter name is a letter followed by letters, digits or _."), z.number().finite())
    .refine((r) => Object.keys(r).length <= 12, "At most 12 start values.")
    .default({}),
});
export type CustomModel = z.infer<typeof customModelSchema>;

export const methodDefinitionSchema = z
  .strictObject({
    name: lineText(200).pipe(z.string().min(2)),
    analyte: lineText(200).pipe(z.string().min(1)),
    wavelength_nm: z.number().finite().positive().max(2000).nullable().default(null),
    path_length_cm: positive.max(100).default(1),
    concentration: z
      .discriminatedUnion("kind", [
        z.strictObject({ kind: z.literal("none") }),
        z.strictObject({ kind: z.literal("beer-lambert"), epsilon: positive, epsilon_unit: z.literal("L mol⁻¹ cm⁻¹").default("L mol⁻¹ cm⁻¹") }),
        z.strictObject({ kind: z.literal("calibration"), calibration_id: z.number().int().positive() }),
      ])
      .default({ kind: "none" }),
    blank: z
      .discriminatedUnion("kind", [
        z.strictObject({ kind: z.literal("none") }),
        z.strictObject({ kind: z.literal("channel") }),
        z.strictObject({ kind: z.literal("value"), value: z.number().finite() }),
      ])
      .default({ kind: "none" }),
    models: z.array(z.enum(FIT_MODELS)).min(1).max(8).default(DEFAULT_METHOD_MODELS),
    weighting: z.enum(["none", "log"]).default("none"),
    window: z.strictObject({ from_s: z.number().finite().min(0).nullable().default(null), to_s: z.number().finite().positive().nullable().default(null) }).default({ from_s: null, to_s: null }),
    custom_models: z.array(customModelSchema).max(10).default([]),
    criteria: z.array(criterionSchema).max(20).default([]),
    notes: z.string().trim().max(4000).default(""),
  })
  .refine((d) => !d.models.includes("formula") || d.custom_models.length > 0, { message: "The own-formula model needs a custom model to fit.", path: ["models"] })
  .refine((d) => d.window.from_s === null || d.window.to_s === null || d.window.to_s > d.window.from_s, { message: "The window must end after it starts.", path: ["window"] });
export type MethodDefinition = z.infer<typeof methodDefinitionSchema>;
export type MethodDefinitionInput = z.input<typeof methodDefinitionSchema>;

export const createMethodSchema = z.strictObject({ definition: methodDefinitionSchema });
export const newMethodVersionSchema = z.strictObject({ definition: methodDefinitionSchema, reason });

export const standardSchema = z.strictObject({
  concentration: z.number().finite().min(0),
  absorbance: z.number().finite(),
  replicate: z.number().int().min(1).max(100).default(1),
});
export type Standard = z.infer<typeof standardSchema>;

export const createCalibrationSchema = z
  .strictObject({
    name: lineText(200).pipe(z.string().min(2)),
    analyte: lineText(200).pipe(z.string().min(1)),
    concentration_unit: z.string().trim().min(1).max(32).default("mol/L"),
    wavelength_nm: z.number().finite().positive().nullable().default(null),
    standards: z.array(standardSchema).min(3, "A calibration needs at least 3 standards.").max(500),
    through_origin: z.boolean().default(false),
    weighting: z.enum(["none", "1/x", "1/x2"]).default("none"),
    sigma: z.enum(["residual", "intercept", "blank"]).default("residual"),
    blank_sd: z.number().finite().positive().nullable().default(null),
  })
  .refine((c) => c.sigma !== "blank" || c.blank_sd !== null, { message: "σ from blanks needs the blanks' standard deviation.", path: ["blank_sd"] })
  .refine((c) => !(c.sigma === "intercept" && c.through_origin), { message: "σ from the intercept needs a line with an intercept.", path: ["sigma"] });
export type CreateCalibration = z.infer<typeof createCalibrationSchema>;

export const listQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  sort: z.string().max(40).default("created_at"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type ListQueryInput = z.infer<typeof listQuerySchema>;

export const assignMethodSchema = z.strictObject({
  methodId: z.number().int().positive().nullable(),
  reason,
  /** Required when the method's wavelength differs from the run's: why the method applies anyway. */
  wavelengthReason: z.string().trim().min(3, "Say why the method applies at a different wavelength (at least 3 characters).").max(1000).optional(),
});

/** What the fitting page needs of a run's method (its newest version). */
export interface MethodForRun {
  id: number;
  version: number;
  name: string;
  models: string[];
  criteria: Criterion[];
  window: { from_s: number | null; to_s: number | null };
  weighting: "none" | "log";
  formula: string | null;
  starts: Record<string, number>;
  pathLengthCm: number;
  conversion: Conversion | null;
}
