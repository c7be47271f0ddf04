import { z } from "zod";

export const createShareSchema = z.strictObject({
  recipient: z.string().trim().email("Give the recipient as an e-mail address.").nullable().optional(),
  days: z.number().int().min(1).max(90).optional(),
});
