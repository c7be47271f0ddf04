// `npm start` / the last step of `npm run demo`: serves the production build on PORT (default 3000).
import { spawn } from "node:child_process";
import path from "node:path";

const port = process.env.PORT ?? "3000";
// No telemetry: the app makes no network request of its own.
const env = { ...process.env, PORT: port, NEXT_TELEMETRY_DISABLED: "1", NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? `http://localhost:${port}` };
const nextBin = path.resolve("node_modules", "next", "dist", "bin", "next");
const child = spawn(process.execPath, [nextBin, "start", "-p", port], { stdio: "inherit", env });
console.log(`Halflight on http://localhost:${port}`);
for (const sig of ["SIGINT", "SIGTERM"] as const) process.on(sig, () => child.kill(sig));
child.on("exit", (code) => process.exit(code ?? 0));
