// `npm start` / the last step of `npm run demo`: serves the production build on PORT (default 3000). The demo
// (HALFLIGHT_DEMO=1) starts the local mail sink when there is no SMTP_URL (messages saved under data/mail, shown on the
// admin's Demo inbox page) and may generate its keys; outside the demo a missing secret or mail server stops the start.
import { spawn } from "node:child_process";
import path from "node:path";
import { openConfiguredDb } from "@/db";
import { checkWritable } from "@/db/writable";
import { issueFirstRunToken } from "@/lib/admin/setup";
import { objectStore } from "@/lib/storage/raw-store";
import { startMailSink } from "../mail/sink";

async function main() {
  const port = process.env.PORT ?? "3000";
  const env: NodeJS.ProcessEnv = { ...process.env, PORT: port, NEXT_TELEMETRY_DISABLED: "1", NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? `http://localhost:${port}` };
  let closeSink: (() => Promise<void>) | null = null;
  const demo = env.HALFLIGHT_DEMO === "1";
  if (!demo) {
    const missing = [
      !env.NEXTAUTH_SECRET && "NEXTAUTH_SECRET (the session-signing secret)",
      !env.AUDIT_KEY && "AUDIT_KEY (the audit trail's key, kept apart from the data)",
      !env.SMTP_URL && env.MAIL_TRANSPORT !== "log" && "SMTP_URL (the mail server for review requests and invitations; or MAIL_TRANSPORT=log to write mail to the log on purpose)",
    ].filter(Boolean);
    if (missing.length) throw new Error(`Halflight will not start without:\n  - ${missing.join("\n  - ")}\nSet them in the environment (README: "Run it for a real lab"), or run the demo with npm run demo.`);
  }
  // A configured object store must be reachable, its bucket there, before any upload is taken.
  const store = objectStore();
  if (store) {
    try {
      await store.check();
    } catch (e) {
      throw new Error(`RAW_STORE_URL is set, but its bucket ${store.config.bucket} at ${store.config.endpoint} cannot be reached (${(e as Error).name}: ${(e as Error).message}).`);
    }
    console.log(`Raw files are kept in the object store ${store.config.endpoint}/${store.config.bucket}.`);
  }
  // The database must take a write before the server says it is ready.
  const { db, where } = openConfiguredDb();
  let firstRunToken: string | null = null;
  try {
    await checkWritable(db, where);
    // A new install (no lab yet): a one-time token for the first-run page, printed here only.
    if (!demo) firstRunToken = await issueFirstRunToken(db);
  } finally {
    await db.destroy();
  }
  if (demo && !env.SMTP_URL) {
    const dir = path.resolve(process.env.MAIL_SINK_DIR ?? "data/mail");
    const sink = await startMailSink(dir, Number(process.env.MAIL_SINK_PORT ?? 2525));
    env.SMTP_URL = `smtp://127.0.0.1:${sink.port}`;
    env.MAIL_SINK_DIR = dir;
    closeSink = sink.close;
    console.log(`Local mail sink on 127.0.0.1:${sink.port}, saving to ${dir}`);
  }
  const nextBin = path.resolve("node_modules", "next", "dist", "bin", "next");
  const child = spawn(process.execPath, [nextBin, "start", "-p", port], { stdio: "inherit", env });
  console.log(`Halflight on http://localhost:${port}`);
  if (firstRunToken)
    console.log(`\nThis database has no lab yet. Set it up (once, within 24 hours) at\n  ${env.NEXTAUTH_URL}/first-run?token=${firstRunToken}\nor with: npm run --silent cli -- setup --lab NAME --slug SLUG --admin-email EMAIL --admin-name NAME\n`);
  for (const sig of ["SIGINT", "SIGTERM"] as const) process.on(sig, () => child.kill(sig));
  child.on("exit", async (code) => {
    await closeSink?.();
    process.exit(code ?? 0);
  });
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
