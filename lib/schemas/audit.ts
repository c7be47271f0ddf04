import { z } from "zod";

export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(100),
  before: z.coerce.number().int().positive().optional(),
  action: z.string().max(64).optional(),
  from: z.string().max(32).optional(),
  to: z.string().max(32).optional(),
  format: z.enum(["json", "csv"]).default("json"),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditEventSchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorUserId: z.number().int().nullable(),
  actorLabel: z.string().nullable(),
  action: z.string(),
  objectType: z.string().nullable(),
  objectId: z.string().nullable(),
  objectVersion: z.number().int().nullable(),
  oldValues: z.unknown(),
  newValues: z.unknown(),
  reason: z.string().nullable(),
  hash: z.string(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
