// `npm start` / the last step of `npm run demo`: serves the production build on PORT (default 3000). Without an
// SMTP_URL it first starts the local mail sink (messages saved under data/mail, shown on the admin's Demo inbox page).
import { spawn } from "node:child_process";
import path from "node:path";
import { startMailSink } from "../mail/sink";

async function main() {
  const port = process.env.PORT ?? "3000";
  const env: NodeJS.ProcessEnv = { ...process.env, PORT: port, NEXT_TELEMETRY_DISABLED: "1", NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? `http://localhost:${port}` };
  let closeSink: (() => Promise<void>) | null = null;
  if (!env.SMTP_URL) {
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
