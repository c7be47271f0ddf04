// Outside the demo nothing is silently faked: a production start without its secrets or a mail server stops with a
// message naming each missing setting (common practice: fail closed on missing configuration).
import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const TSX = path.resolve("node_modules/tsx/dist/cli.mjs");

function start(env: Record<string, string>) {
  return spawnSync(process.execPath, [TSX, "lib/cli/serve.ts"], { encoding: "utf8", timeout: 60_000, env: { PATH: process.env.PATH!, HOME: process.env.HOME!, ...env } as unknown as NodeJS.ProcessEnv });
}

describe("npm start outside the demo", () => {
  it("refuses to start without NEXTAUTH_SECRET, AUDIT_KEY and SMTP_URL, naming each", () => {
    const r = start({});
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/will not start without/);
    for (const name of ["NEXTAUTH_SECRET", "AUDIT_KEY", "SMTP_URL"]) expect(r.stderr).toContain(name);
  });
  it("the session secret and the audit key are never generated in production outside the demo", () => {
    const code = `import("./lib/auth/secret.ts").then(async (mod) => { const m = mod.authSecret ? mod : mod.default; try { m.authSecret(); console.log("generated"); } catch (e) { console.log(e.message); } const km = await import("./lib/audit/key.ts"); const k = km.auditKey ? km : km.default; try { k.auditKey(); console.log("generated"); } catch (e) { console.log(e.message); } })`;
    const r = spawnSync(process.execPath, [TSX, "-e", code], { encoding: "utf8", env: { PATH: process.env.PATH!, HOME: process.env.HOME!, NODE_ENV: "production" } as unknown as NodeJS.ProcessEnv });
    expect(r.stdout).toMatch(/NEXTAUTH_SECRET is not set/);
    expect(r.stdout).toMatch(/AUDIT_KEY is not set/);
    expect(r.stdout).not.toMatch(/generated/);
  });
});

describe("npm start with a database it cannot write", () => {
  it("stops at start with a message saying so, instead of a server that fails every request", async () => {
    const fs = await import("node:fs");
    const os = await import("node:os");
    const { openDb } = await import("@/db");
    const { migrateToLatest } = await import("@/db/migrate");
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-ro-"));
    const file = path.join(dir, "lab.sqlite");
    const db = openDb(file);
    await migrateToLatest(db);
    await db.destroy();
    fs.chmodSync(file, 0o444);
    fs.chmodSync(dir, 0o555);
    // Root writes through file modes, so as root the server is started as the unprivileged "nobody" user.
    const asRoot = process.getuid?.() === 0;
    if (asRoot) fs.chmodSync(path.dirname(dir), fs.statSync(path.dirname(dir)).mode | 0o001);
    const r = spawnSync(process.execPath, [TSX, "lib/cli/serve.ts"], {
      encoding: "utf8",
      timeout: 60_000,
      ...(asRoot ? { uid: 65534, gid: 65534 } : {}),
      env: { PATH: process.env.PATH!, HOME: dir, NEXTAUTH_SECRET: "s".repeat(32), AUDIT_KEY: "k".repeat(32), MAIL_TRANSPORT: "log", DATABASE_FILE: file, PORT: "3999" } as unknown as NodeJS.ProcessEnv,
    });
    fs.chmodSync(dir, 0o755);
    fs.rmSync(dir, { recursive: true, force: true });
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/Halflight will not start: the database .*lab\.sqlite cannot be written, because it is read-only/);
    expect(r.stdout).not.toMatch(/Halflight on http/);
  });
});

describe("npm start without devDependencies", () => {
  it("runs the bundle npm run build writes (node, no tsx), and the bundle imports only dependencies and Node's own modules", async () => {
    const pkg = JSON.parse((await import("node:fs")).readFileSync("package.json", "utf8")) as { scripts: Record<string, string>; dependencies: Record<string, string> };
    expect(pkg.scripts.start).toBe("node dist/serve.mjs");
    expect(pkg.scripts.build).toMatch(/npm run build:server/);
    const { build } = await import("esbuild");
    const r = await build({ entryPoints: ["lib/cli/serve.ts", "lib/jobs/worker.ts"], bundle: true, platform: "node", format: "esm", packages: "external", write: false, metafile: true, outdir: "dist", logLevel: "silent" });
    const imported = new Set<string>();
    for (const input of Object.values(r.metafile.inputs)) for (const i of input.imports) if (i.external) imported.add(i.path);
    const { builtinModules } = await import("node:module");
    const outside = [...imported].filter((p) => !p.startsWith("node:") && !builtinModules.includes(p)).map((p) => (p.startsWith("@") ? p.split("/").slice(0, 2).join("/") : p.split("/")[0]!));
    expect(outside.length).toBeGreaterThan(0);
    for (const name of new Set(outside)) expect(pkg.dependencies, `${name} is imported by npm start but is not a dependency`).toHaveProperty(name);
  });
});
