import { z } from "zod";
import { lineText } from "./common";

export const studyMemberSchema = z.strictObject({
  fitId: z.number().int().positive(),
  /** Overrides the run's temperature; a changed temperature needs a reason. */
  temperature_c: z.number().finite().nullable().optional(),
  temperature_reason: z.string().trim().min(3).max(500).optional(),
  /** For excess-concentration studies: the excess reagent's concentration (mol/L). */
  excess_mol_l: z.number().positive().finite().optional(),
});

export const studyOptionsSchema = z.strictObject({
  weighted: z.boolean().default(true),
  target_c: z.number().finite().nullable().optional(),
});

export const createStudySchema = z.strictObject({
  name: lineText(200).pipe(z.string().min(1)),
  kind: z.enum(["temperature", "excess"]).default("temperature"),
  members: z.array(studyMemberSchema).min(2, "A study needs at least two rate constants.").max(60),
  options: studyOptionsSchema.default({ weighted: true }),
});

export const changeStudySchema = z.strictObject({
  name: lineText(200).pipe(z.string().min(1)).optional(),
  members: z.array(studyMemberSchema).min(2).max(60).optional(),
  options: studyOptionsSchema.optional(),
  reason: z.string().trim().min(3, "Say why this version changes the study.").max(1000),
});
export type CreateStudy = z.infer<typeof createStudySchema>;
export type ChangeStudy = z.infer<typeof changeStudySchema>;
export type StudyMember = z.infer<typeof studyMemberSchema>;
