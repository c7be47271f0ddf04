import { z } from "zod";
import { MODEL_IDS } from "@/lib/kinetics/models";

/** Every model of the engine's model table, own formula included. */
export const FIT_MODELS = MODEL_IDS;

import { NO_CONTROL } from "./common";

export { NO_CONTROL };
const PARAMETER_NAME = /^[A-Za-z][A-Za-z0-9_]{0,31}$/;
const parameterValues = z
  .record(z.string().regex(PARAMETER_NAME, "A parameter name is a letter followed by letters, digits or _."), z.number().finite())
  .refine((r) => Object.keys(r).length <= 12, "At most 12 parameter values.");

export const fitOptionsSchema = z.strictObject({
  models: z.array(z.enum(FIT_MODELS)).min(1).max(8),
  formula: z.string().max(500).nullable().optional(),
  window: z.strictObject({ from: z.number().finite().nullable().optional(), to: z.number().finite().nullable().optional() }).optional(),
  // Excluding more than this point by point is a window's job.
  exclusions: z.array(z.strictObject({ index: z.number().int().min(0), reason: z.string().trim().min(3, "Give a reason of at least 3 characters for each excluded point.").max(500) })).max(10_000).optional(),
  fixed: parameterValues.optional(),
  starts: parameterValues.optional(),
  interval: z.number().positive().finite().nullable().optional(),
  logWeights: z.boolean().optional(),
  conversion: z
    .discriminatedUnion("kind", [
      z.strictObject({ kind: z.literal("beer-lambert"), epsilon: z.number().positive().finite(), pathLengthCm: z.number().positive().finite(), blank: z.number().finite().nullable().optional() }),
      // The numbers travel with the id so the browser can fit at once; the server checks them against the stored calibration.
      z.strictObject({
        kind: z.literal("calibration"),
        calibrationId: z.number().int().positive(),
        slope: z.number().finite().refine((v) => v !== 0, "A calibration slope of zero cannot convert readings."),
        seSlope: z.number().finite().min(0),
        intercept: z.number().finite(),
        unit: z.string().trim().min(1).max(32),
        blank: z.number().finite().nullable().optional(),
      }),
    ])
    .nullable()
    .optional(),
});
export type FitOptions = z.infer<typeof fitOptionsSchema>;

export const saveFitSchema = z.strictObject({
  runId: z.number().int().positive(),
  seriesId: z.number().int().positive(),
  title: z.string().trim().min(1).max(200).regex(NO_CONTROL, "A title may not contain control characters.").optional(),
  options: fitOptionsSchema,
  /** Saving a change to an existing record: the version it changes, and why. */
  previousId: z.number().int().positive().optional(),
  reason: z.string().trim().max(1000).optional(),
});
export type SaveFitInput = z.infer<typeof saveFitSchema>;

export const fitListQuerySchema = z.object({
  runId: z.coerce.number().int().positive().optional(),
  q: z.string().max(100).optional(),
  sort: z.enum(["created_at", "title", "k_value", "version"]).default("created_at"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
