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

const reason = z.string().trim().min(3, "Say why (at least 3 characters).").max(500);
export const memberActionSchema = z.discriminatedUnion("action", [
  z.strictObject({ action: z.literal("unlock"), reason }),
  z.strictObject({ action: z.literal("deactivate"), reason }),
  z.strictObject({ action: z.literal("reactivate"), reason }),
  z.strictObject({ action: z.literal("role"), role: z.enum(ROLES), reason }),
]);
export type MemberAction = z.infer<typeof memberActionSchema>;
