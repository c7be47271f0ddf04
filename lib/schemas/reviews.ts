import { z } from "zod";

export const submitSchema = z.object({ password: z.string().min(1, "Enter your password to sign.") });
export const decisionSchema = z.object({
  decision: z.enum(["approved", "rejected"]),
  password: z.string().min(1, "Enter your password to sign."),
  meaning: z.enum(["reviewed", "approved"]).optional(),
  reason: z.string().trim().max(2000).optional(),
});
export const withdrawSchema = z.object({ reason: z.string().trim().min(3, "Say why the submission is withdrawn.").max(2000) });
export const commentSchema = z.object({ body: z.string().trim().min(1, "Write the comment first.").max(5000), parentId: z.number().int().positive().optional() });
