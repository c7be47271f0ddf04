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
