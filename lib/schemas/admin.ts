import { z } from "zod";
import { ROLES } from "@/lib/permissions/roles";
import { lineText } from "./common";

export const labSettingsSchema = z.strictObject({
  outside_links: z.boolean(),
  default_link_days: z.number().int().min(1).max(365),
  upload_limit_mb: z.number().int().min(1).max(500),
  password_min_length: z.number().int().min(10, "Passwords shorter than 10 characters are not allowed here.").max(128),
  reason: z.string().trim().min(3, "Say why (at least 3 characters).").max(500),
});
export type LabSettingsInput = z.infer<typeof labSettingsSchema>;

export const inviteSchema = z.strictObject({
  email: z.string().trim().toLowerCase().email("Give a valid e-mail address.").max(254),
  name: lineText(200).pipe(z.string().min(1)),
  role: z.enum(ROLES),
  days: z.number().int().min(1).max(30).default(7),
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const acceptInvitationSchema = z.strictObject({ password: z.string().min(1).max(256) });

export const createApiKeySchema = z.strictObject({ name: lineText(120).pipe(z.string().min(2)) });
