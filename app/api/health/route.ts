import { getDb } from "@/db";
import { checkHealth } from "@/lib/health";

// Public by design (a load balancer has no session): 200 when the server can serve, 503 with what is wrong otherwise.
export const dynamic = "force-dynamic";

export async function GET(): Promise<Response> {
  let health;
  try {
    health = await checkHealth(await getDb());
  } catch {
    health = { ok: false, database: { reachable: false, migrations: "unknown" as const }, mail: { configured: Boolean(process.env.SMTP_URL || process.env.MAIL_TRANSPORT === "log"), transport: "none" as const } };
  }
  return Response.json(health, { status: health.ok ? 200 : 503, headers: { "cache-control": "no-store" } });
}
