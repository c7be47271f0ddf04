import { z } from "zod";

export const submitSchema = z.strictObject({ password: z.string().min(1, "Enter your password to sign.").max(256) });
export const decisionSchema = z.strictObject({
  decision: z.enum(["approved", "rejected"]),
  password: z.string().min(1, "Enter your password to sign.").max(256),
  meaning: z.enum(["reviewed", "approved"]).optional(),
  reason: z.string().trim().max(2000).optional(),
});
export const withdrawSchema = z.strictObject({ reason: z.string().trim().min(3, "Say why the submission is withdrawn.").max(2000) });
export const commentSchema = z.strictObject({ body: z.string().trim().min(1, "Write the comment first.").max(5000), parentId: z.number().int().positive().optional() });
