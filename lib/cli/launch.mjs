// `npm run cli`: runs the command line from its compiled bundle (dist/cli/main.mjs, made by `npm run build`; split so a
// command loads only what it uses) when the bundle is newer than every source file it is built from, so a command
// starts on plain Node in a fraction of a second; otherwise (a fresh checkout, or sources changed since the build) from
// the TypeScript sources through tsx.
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");
const bundle = path.join(root, "dist", "cli", "main.mjs");

function newestSource(dir) {
  let newest = 0;
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    if (e.name === "node_modules" || e.name === "fixtures" || e.name.startsWith(".")) continue;
    const p = path.join(dir, e.name);
    if (e.isDirectory()) newest = Math.max(newest, newestSource(p));
    else if (/\.(ts|mts|json)$/.test(e.name)) newest = Math.max(newest, fs.statSync(p).mtimeMs);
  }
  return newest;
}

let fresh = false;
try {
  const built = fs.statSync(bundle).mtimeMs;
  fresh = ["lib", "parsers", "db"].every((d) => newestSource(path.join(root, d)) <= built);
} catch {
  fresh = false;
}

if (fresh) {
  const { runCli } = await import(pathToFileURL(bundle).href);
  const { code, out, err } = await runCli(process.argv.slice(2));
  if (out) process.stdout.write(out);
  if (err) process.stderr.write(err);
  process.exitCode = code;
} else {
  // The sources as they are, through tsx (a devDependency: present wherever the sources are newer than a build).
  const { spawnSync } = await import("node:child_process");
  const tsx = path.join(root, "node_modules", "tsx", "dist", "cli.mjs");
  const r = spawnSync(process.execPath, [tsx, path.join(root, "lib", "cli", "main.ts"), ...process.argv.slice(2)], { stdio: "inherit" });
  process.exitCode = r.status ?? 1;
}
