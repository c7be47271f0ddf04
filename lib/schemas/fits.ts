import { z } from "zod";
import { MODEL_IDS } from "@/lib/kinetics/models";

/** Every model of the engine's model table, own formula included. */
export const FIT_MODELS = MODEL_IDS;

export const fitOptionsSchema = z.object({
  models: z.array(z.enum(FIT_MODELS)).min(1).max(8),
  formula: z.string().max(500).nullable().optional(),
  window: z.object({ from: z.number().finite().nullable().optional(), to: z.number().finite().nullable().optional() }).optional(),
  exclusions: z.array(z.object({ index: z.number().int().min(0), reason: z.string().trim().min(3, "Give a reason of at least 3 characters for each excluded point.").max(500) })).max(100_000).optional(),
  fixed: z.record(z.string(), z.number().finite()).optional(),
  starts: z.record(z.string(), z.number().finite()).optional(),
  interval: z.number().positive().finite().nullable().optional(),
  logWeights: z.boolean().optional(),
  conversion: z
    .discriminatedUnion("kind", [
      z.object({ kind: z.literal("beer-lambert"), epsilon: z.number().positive().finite(), pathLengthCm: z.number().positive().finite(), blank: z.number().finite().nullable().optional() }),
      // The numbers travel with the id so the browser can fit at once; the server checks them against the stored calibration.
      z.object({
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

export const saveFitSchema = z.object({
  runId: z.number().int().positive(),
  seriesId: z.number().int().positive(),
  title: z.string().trim().min(1).max(200).optional(),
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
