import { z } from "zod";
import { ROLES } from "@/lib/permissions/roles";

export const meSchema = z.object({
  user: z.object({ id: z.number().int(), email: z.string(), name: z.string() }),
  lab: z.object({ id: z.number().int(), slug: z.string(), name: z.string() }),
  role: z.enum(ROLES),
  permissions: z.array(z.string()),
});
export type Me = z.infer<typeof meSchema>;
