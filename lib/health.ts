// What a load balancer asks before sending users: is the database reachable, are its migrations current, is mail
// configured. No secrets and no counts in the answer.
import type { Knex } from "knex";
import { MIGRATIONS } from "@/db/migrations";
import { objectStore } from "@/lib/storage/raw-store";

export interface Health {
  ok: boolean;
  database: { reachable: boolean; migrations: "current" | "behind" | "unknown"; pending?: number };
  mail: { configured: boolean; transport: "smtp" | "log" | "none" };
  raw_store: { kind: "database" | "object-store"; reachable: boolean };
}

export async function checkHealth(db: Knex, env: Record<string, string | undefined> = process.env): Promise<Health> {
  const mail: Health["mail"] = env.SMTP_URL ? { configured: true, transport: "smtp" } : env.MAIL_TRANSPORT === "log" ? { configured: true, transport: "log" } : { configured: false, transport: "none" };
  let database: Health["database"];
  try {
    const done: Array<{ name: string }> = await db("knex_migrations").select("name");
    const names = new Set(done.map((d) => d.name));
    const pending = MIGRATIONS.filter((m) => !names.has(m.name)).length;
    database = { reachable: true, migrations: pending ? "behind" : "current", ...(pending ? { pending } : {}) };
  } catch {
    database = { reachable: false, migrations: "unknown" };
  }
  let raw_store: Health["raw_store"] = { kind: "database", reachable: database.reachable };
  const store = objectStore();
  if (store) raw_store = { kind: "object-store", reachable: await store.check().then(() => true, () => false) };
  return { ok: database.reachable && database.migrations === "current" && mail.configured && raw_store.reachable, database, mail, raw_store };
}
