import { z } from "zod";
import { ROLES } from "@/lib/permissions/roles";

export const memberSchema = z.object({
  userId: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  disabled: z.boolean(),
  lockedUntil: z.string().nullable(),
  failedSignIns: z.number().int(),
});
export type Member = z.infer<typeof memberSchema>;
