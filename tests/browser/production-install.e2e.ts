// `npm start` on an install without devDependencies, as a lab installs it: the build (next build + the bundled start
// script and job worker) is copied with the app's files, `npm prune --omit=dev` removes every devDependency (tsx, the
// TypeScript compiler, vitest, esbuild), and the start script then serves on plain Node: health answered, a page
// rendered; the command line runs its compiled bundle there too (a fit of a fixture). The copy's node_modules are hard links of the checkout's, which
// npm prune unlinks without touching the originals; the lockfiles are real copies.
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../helpers/free-port";
import { productionEnv } from "../helpers/production-env";

const root = path.resolve(__dirname, "..", "..");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-production-install-"));
const app = path.join(dir, "app");
let server: ChildProcess | undefined;
let out = "";
let base = "";


/** A copy by hard links (instant, no space), or a plain copy where the temporary folder is on another file system. */
function copyTree(from: string, to: string): void {
  try {
    execFileSync("cp", ["-al", from, to], { stdio: "pipe" });
  } catch {
    fs.rmSync(to, { recursive: true, force: true });
    execFileSync("cp", ["-a", "--reflink=auto", from, to], { stdio: "pipe" });
  }
}

beforeAll(async () => {
  fs.mkdirSync(app);
  for (const name of fs.readdirSync(root)) {
    if ([".git", "node_modules", "tests", "data"].includes(name) || name.endsWith(".tsbuildinfo")) continue;
    if (name === "package.json" || name === "package-lock.json") fs.copyFileSync(path.join(root, name), path.join(app, name));
    else copyTree(path.join(root, name), path.join(app, name));
  }
  copyTree(path.join(root, "node_modules"), path.join(app, "node_modules"));
  fs.rmSync(path.join(app, "node_modules", ".package-lock.json"), { force: true }); // npm rewrites it; not a shared inode
  execFileSync("npm", ["prune", "--omit=dev", "--offline", "--no-audit", "--no-fund"], { cwd: app, stdio: "pipe", env: { ...process.env, npm_config_loglevel: "error" } });

  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  // The start script from package.json, as `npm start` runs it.
  const start = (JSON.parse(fs.readFileSync(path.join(app, "package.json"), "utf8")) as { scripts: { start: string } }).scripts.start;
  server = spawn("sh", ["-c", start], {
    cwd: app,
    env: productionEnv(dir, port, base, { NODE_ENV: "production" }),
    detached: true,
  });
  server.stdout!.on("data", (b: Buffer) => (out += b.toString()));
  server.stderr!.on("data", (b: Buffer) => (out += b.toString()));
  const until = Date.now() + 90_000;
  while (!/Ready in/.test(out) && server.exitCode === null && Date.now() < until) await new Promise((r) => setTimeout(r, 200));
});

afterAll(async () => {
  if (server?.pid && server.exitCode === null) {
    process.kill(-server.pid, "SIGTERM");
    await new Promise((r) => server!.once("exit", r));
  }
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("npm start after npm prune --omit=dev", () => {
  it("has no devDependency left, and the checkout's own install is untouched", () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(root, "package.json"), "utf8")) as { devDependencies: Record<string, string> };
    const dev = Object.keys(pkg.devDependencies);
    // The build and test tools are gone (type packages that a production package itself depends on may stay).
    const tools = ["tsx", "typescript", "vitest", "esbuild", "eslint", "playwright-core"];
    expect(dev).toEqual(expect.arrayContaining(tools));
    for (const name of tools) expect(fs.existsSync(path.join(app, "node_modules", name)), name).toBe(false);
    for (const name of ["tsx", "vitest"]) expect(fs.existsSync(path.join(root, "node_modules", name)), name).toBe(true);
    for (const name of ["next", "knex", "better-sqlite3"]) expect(fs.existsSync(path.join(app, "node_modules", name)), name).toBe(true);
  });

  it("starts on plain Node: health answered, migrations applied, a page rendered", async () => {
    expect(out).toMatch(/Ready in/);
    const health = await fetch(`${base}/api/health`);
    expect(health.status).toBe(200);
    expect(await health.json()).toMatchObject({ ok: true, database: { reachable: true } });
    // A new install without a lab offers its one-time set-up page.
    const first = await fetch(`${base}/first-run`, { redirect: "manual" });
    expect(first.status).toBe(200);
    expect(await first.text()).toMatch(/Halflight/);
    expect(out).not.toMatch(/Cannot find (module|package)|ERR_MODULE_NOT_FOUND/);
  });

  it("the command line runs from its compiled bundle without tsx: a first-order fit of a fixture", () => {
    const r = execFileSync(process.execPath, ["lib/cli/launch.mjs", "fit", "parsers/delimited/fixtures/cv-iso.csv", "--model", "first-order", "--json"], { cwd: app, encoding: "utf8", env: { PATH: process.env.PATH!, HOME: dir } as unknown as NodeJS.ProcessEnv });
    const fit = JSON.parse(r) as { model: string; converged: boolean; parameters: Array<{ name: string; value: number }> };
    expect(fit).toMatchObject({ model: "first-order", converged: true });
    expect(fit.parameters.find((p) => p.name === "k")!.value).toBeGreaterThan(0);
  });
});
