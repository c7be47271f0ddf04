// The command-line contract (../shared/contracts/CLI.md): names, units and JSON fields, exit codes, refusals.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { runCli } from "@/lib/cli/main";
import { emptyTarget } from "../helpers/db";

const CV = "fixtures/published/crystal-violet-590nm.csv";
const FIX = "parsers/delimited/fixtures";

function cli(...args: string[]) {
  const r = spawnSync("npm", ["run", "--silent", "cli", "--", ...args], { encoding: "utf8" });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

function tmp(name: string, text: string): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-cli-"));
  const f = path.join(dir, name);
  fs.writeFileSync(f, text);
  return f;
}

describe("npm run --silent cli (spawned, as outside checks run it)", () => {
  it("parse prints the contract's JSON", () => {
    const r = cli("parse", CV, "--json");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j).toMatchObject({ parser: "delimited", metadata: { wavelength_nm: 590, path_length_cm: 1 } });
    expect(j.series[0]).toMatchObject({ name: "A (590 nm)", quantity: "absorbance", unit: "AU", skipped_lines: [] });
    expect(j.series[0].t).toEqual([0, 60, 180, 300, 420, 540, 660, 780, 900]);
    expect(Array.isArray(j.warnings)).toBe(true);
  });

  it("fit --model first-order gives the contract's fields, per second (crystal violet, CHECKS.md)", () => {
    const r = cli("fit", CV, "--model", "first-order", "--json");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const key of ["model", "n", "parameters", "ssr", "dof", "r2", "aicc", "runs", "durbin_watson", "converged", "iterations", "message"]) expect(j).toHaveProperty(key);
    expect(j).toMatchObject({ model: "first-order", n: 9, dof: 6, runs: 4, converged: true });
    const k = j.parameters.find((p: { name: string }) => p.name === "k");
    expect(k.value * 60).toBeCloseTo(0.2902, 4);
    expect(k.fixed).toBe(false);
    expect(k.ci95[0]).toBeLessThan(k.value);
    expect(j.aicc).toBeCloseTo(-99.34, 2);
  });

  it("a refused file exits non-zero with one line on stderr naming the line, and no stack trace", () => {
    const r = cli("parse", `${FIX}/bad-half-number.csv`, "--json");
    expect(r.code).not.toBe(0);
    expect(r.out).toBe("");
    expect(r.err).toMatch(/line 4: "A" holds "0\.5x26", which is not a number/);
    expect(r.err).not.toMatch(/\bat .*\.ts:\d+/);
  });
});

describe("cli validate", () => {
  it("passes every case on this installation, and fails when a reference value is altered", () => {
    const ok = cli("validate", "--json");
    expect(ok.code, ok.err).toBe(0);
    const report = JSON.parse(ok.out);
    expect(report.all_passed).toBe(true);
    expect(report.cases.length).toBeGreaterThan(250);
    expect(report.reference_files.find((f: { file: string }) => f.file === "nist/Misra1a.dat").sha256).toMatch(/^[0-9a-f]{64}$/);

    // A deliberately corrupted copy of the references: one certified value of Misra1a changed in its 4th digit.
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-validate-"));
    fs.cpSync("fixtures/nist", path.join(dir, "nist"), { recursive: true });
    fs.cpSync("fixtures/validation", path.join(dir, "validation"), { recursive: true });
    const idx = JSON.parse(fs.readFileSync(path.join(dir, "nist/index.json"), "utf8"));
    idx.datasets.Misra1a.certified[0] *= 1.001;
    fs.writeFileSync(path.join(dir, "nist/index.json"), JSON.stringify(idx));
    const bad = cli("validate", "--reference", dir);
    expect(bad.code).not.toBe(0);
    expect(bad.out).toMatch(/FAIL Misra1a b1/);
    expect(bad.out).toMatch(/\d+ passed, [1-9]\d* failed/);
  });
});

describe("cli verbs in-process", () => {
  const run = async (...a: string[]) => {
    const r = await runCli(a);
    return { ...r, json: r.out ? JSON.parse(r.out) : null };
  };

  it("--fix holds a parameter: fixed true, se null, not counted in dof", async () => {
    const r = await run("fit", CV, "--model", "first-order", "--fix", "ainf=0.04", "--json");
    const ainf = r.json.parameters.find((p: { name: string }) => p.name === "ainf");
    expect(ainf).toMatchObject({ value: 0.04, fixed: true, se: null });
    expect(r.json.dof).toBe(7);
  });

  it("linearized with --fix ainf, guggenheim and kezdy-swinbourne with --interval", async () => {
    const lin = await run("fit", CV, "--model", "linearized", "--fix", "ainf=0.04", "--json");
    expect(lin.json.parameters.map((p: { name: string }) => p.name)).toEqual(["k", "a0", "ainf"]);
    const g = await run("fit", CV, "--model", "guggenheim", "--interval", "360", "--json");
    expect(g.code).toBe(0);
    expect(g.json.model).toBe("guggenheim");
    const ks = await run("fit", CV, "--model", "kezdy-swinbourne", "--interval", "120", "--json");
    expect(ks.json.parameters.map((p: { name: string }) => p.name)).toEqual(["k", "ainf"]);
  });

  it("--formula with ^, atan and pi; its parameters are the free names", async () => {
    const f = tmp("misra.csv", "Time (s),y\n" + [0, 1, 2, 3, 4, 5, 6, 8].map((t) => `${t},${(3 * (1 - Math.exp(-0.4 * t)) + 0.1 * Math.atan(t) / Math.PI) ** 1}`).join("\n"));
    const r = await run("fit", f, "--formula", "b1*(1-exp(-b2*t)) + b3*atan(t)/pi", "--start", "b1=2", "--start", "b2=0.3", "--start", "b3=0", "--json");
    expect(r.code).toBe(0);
    expect(r.json.parameters.map((p: { name: string }) => p.name)).toEqual(["b1", "b2", "b3"]);
    expect(r.json.parameters[1].value).toBeCloseTo(0.4, 8);
  });

  it("--series picks a channel by name; an unknown one is refused", async () => {
    const r = await run("fit", `${FIX}/cv-clock-midnight.csv`, "--series", "Cell 2 (A)", "--model", "first-order", "--json");
    expect(r.json.n).toBe(7);
    expect(r.json.series).toBe("Cell 2 (A)");
    const bad = await run("fit", `${FIX}/cv-clock-midnight.csv`, "--series", "Cell 9", "--json");
    expect(bad.code).not.toBe(0);
    expect(bad.err).toMatch(/there is no series "Cell 9"/);
  });

  it("a fit that does not converge exits 0 with converged false and a message", async () => {
    const r = await run("fit", CV, "--formula", "b1*exp(b2*t)", "--start", "b1=1", "--start", "b2=50", "--json");
    expect(r.code).toBe(0);
    expect(r.json.converged).toBe(false);
    expect(r.json.message).toMatch(/failed/);
    expect(r.json.parameters.every((p: { value: unknown }) => p.value === null)).toBe(true);
  });

  it("bad options are refused with a usage hint", async () => {
    expect((await run("fit", CV, "--fix", "ainf", "--json")).err).toMatch(/write it as NAME=NUMBER/);
    expect((await run("fit", CV, "--model", "nope", "--json")).err).toMatch(/There is no model "nope"/);
    expect((await run("frobnicate", CV)).code).toBe(2);
    expect((await run("parse", "no/such/file.csv", "--json")).err).toMatch(/no such file/);
  });

  it("arrhenius over °C or K, with and without standard errors (N2O5, CHECKS.md)", async () => {
    const r = await run("arrhenius", "fixtures/published/n2o5-arrhenius.csv", "--json");
    expect(r.json.n).toBe(3);
    expect(r.json.ea.unit).toBe("J/mol");
    expect(r.json.ea.value / 1000).toBeCloseTo(103.49, 2);
    expect(r.json.ea.se / 1000).toBeCloseTo(0.8, 2);
    expect(r.json.eyring.dH.unit).toBe("J/mol");
    expect(r.json.eyring.dS.unit).toBe("J/(mol K)");
    const c = tmp("c.csv", "T (°C),k (1/s),SE\n24.85,3.5e-5,0.2e-5\n44.85,5.0e-4,0.3e-4\n64.85,4.9e-3,0.2e-3\n");
    const w = await run("arrhenius", c, "--json");
    expect(w.json.weighted).toBe(true);
    expect(w.json.ea.ci95).toHaveLength(2);
    const two = await run("arrhenius", tmp("two.csv", "T (K),k\n298,3.5e-5\n318,5.0e-4\n"), "--json");
    expect(two.json.ea.se).toBeNull();
    const none = await run("arrhenius", tmp("bad.csv", "Temp,k\n298,1\n318,2\n"), "--json");
    expect(none.err).toMatch(/no temperature column: put °C or K in its header/);
  });

  it("ingest stores a file in DATABASE_FILE once, and refuses bad input leaving the database unchanged", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-ingest-"));
    const env = { ...process.env, DATABASE_FILE: path.join(dir, "cli.sqlite") };
    const run = (...a: string[]) => spawnSync("npm", ["run", "--silent", "cli", "--", ...a], { encoding: "utf8", env });
    const first = run("ingest", CV, "--json");
    expect(first.status, first.stderr).toBe(0);
    const j = JSON.parse(first.stdout);
    expect(j).toMatchObject({ run_id: 1, lab: "default", existing: false, series: [{ name: "A (590 nm)", points: 9 }] });
    expect(j.raw_file_sha256).toMatch(/^[0-9a-f]{64}$/);
    const again = JSON.parse(run("ingest", CV, "--json").stdout);
    expect(again).toMatchObject({ run_id: 1, existing: true });
    const bad = run("ingest", `${FIX}/bad-backwards.csv`, "--json");
    expect(bad.status).not.toBe(0);
    expect(bad.stderr).toMatch(/bad-backwards\.csv: line 5: the time goes backwards/);
    const other = JSON.parse(run("ingest", `${FIX}/cv-iso.csv`, "--json").stdout);
    expect(other.run_id).toBe(2); // the refused file wrote nothing, not even a run number
    expect(run("ingest", CV, "--lab", "nowhere").stderr).toMatch(/no lab with the slug "nowhere"/);
  });
});

describe("cli setup (spawned): a real lab and its first administrator", () => {
  const run = (args: string[], env: Record<string, string>, input?: string) =>
    spawnSync("npm", ["run", "--silent", "cli", "--", "setup", ...args], { encoding: "utf8", input, env: { ...process.env, ...env } });
  const args = ["--lab", "North Shore Stability Lab", "--slug", "north-shore", "--admin-email", "Head@North.example", "--admin-name", "R. Okafor", "--json"];

  it("creates the lab and its administrator (no demo data), refuses a second time, and the administrator can sign in", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-setup-"));
    const target = await emptyTarget(path.join(dir, "lab.sqlite"));
    try {
      const r = run(args, { ...target.env, HALFLIGHT_ADMIN_PASSWORD: "a long and private passphrase" });
      expect(r.status, r.stderr).toBe(0);
      const out = JSON.parse(r.stdout) as { lab_id: number; user_id: number };
      expect(out).toEqual({ lab_id: expect.any(Number), user_id: expect.any(Number) });
      const { signInWithPassword } = await import("@/lib/auth/sign-in");
      const db = target.open();
      try {
        expect(await db("labs").select("slug", "name")).toEqual([{ slug: "north-shore", name: "North Shore Stability Lab" }]);
        expect(Number((await db("runs").count({ n: "*" }))[0]!.n)).toBe(0);
        const me = await signInWithPassword(db, "head@north.example", "a long and private passphrase");
        expect(me).toMatchObject({ role: "admin", labSlug: "north-shore", name: "R. Okafor" });
        const actions = (await db("audit_events").orderBy("id").select("action")).map((a) => a.action);
        expect(actions.slice(0, 2)).toEqual(["lab.created", "member.added"]);
        const counts = async () => [Number((await db("labs").count({ n: "*" }))[0]!.n), Number((await db("users").count({ n: "*" }))[0]!.n)];
        const before = await counts();
        // The same slug again: refused, named, nothing written.
        const again = run(args.map((a) => (a === "Head@North.example" ? "other@north.example" : a)), { ...target.env, HALFLIGHT_ADMIN_PASSWORD: "a different private passphrase" });
        expect(again.status).not.toBe(0);
        expect(again.stderr).toMatch(/slug "north-shore" already exists; nothing was written/);
        // The same e-mail under a new slug: refused too.
        const email = run(args.map((a) => (a === "north-shore" ? "south-shore" : a)), { ...target.env, HALFLIGHT_ADMIN_PASSWORD: "a different private passphrase" });
        expect(email.stderr).toMatch(/head@north\.example already has an account/);
        expect(await counts()).toEqual(before);
      } finally {
        await db.destroy();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  it("reads the password from standard input, and refuses a weak one or a bad slug without writing", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-setup-"));
    const target = await emptyTarget(path.join(dir, "lab.sqlite"));
    const env = { ...target.env, HALFLIGHT_ADMIN_PASSWORD: "" };
    delete (env as Record<string, string | undefined>).HALFLIGHT_ADMIN_PASSWORD;
    try {
      const weak = run(args, env, "short\n");
      expect(weak.status).not.toBe(0);
      expect(weak.stderr).toMatch(/at least 12 characters.*Nothing was written/s);
      const slug = run(args.map((a) => (a === "north-shore" ? "North Shore!" : a)), env, "a long and private passphrase\n");
      expect(slug.stderr).toMatch(/slug: A slug is lower-case letters/);
      const ok = run(args, env, "a long and private passphrase\n");
      expect(ok.status, ok.stderr).toBe(0);
      expect(JSON.parse(ok.stdout).lab_id).toBe(1);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe.skipIf(Boolean(process.env.DATABASE_URL))("npm run db:backup (SQLite's online backup API)", () => {
  it("copies a live database to a new file that passes SQLite's integrity check, and refuses to overwrite", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-backup-"));
    try {
      const { openDb } = await import("@/db");
      const { migrateToLatest } = await import("@/db/migrate");
      const { seedDemoWhenEmpty } = await import("@/db/seeds/demo");
      const live = openDb(path.join(dir, "lab.sqlite"));
      await migrateToLatest(live);
      await seedDemoWhenEmpty(live);
      const env = { ...process.env, DATABASE_FILE: path.join(dir, "lab.sqlite"), DATABASE_URL: "" };
      // The server's connection stays open while the copy is made.
      const r = spawnSync("npm", ["run", "--silent", "db:backup", "--", path.join(dir, "copy.sqlite")], { encoding: "utf8", env });
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/integrity check ok; \d+ audit events/);
      const copy = openDb(path.join(dir, "copy.sqlite"));
      expect(Number((await copy("users").count({ n: "*" }))[0]!.n)).toBe(Number((await live("users").count({ n: "*" }))[0]!.n));
      await copy.destroy();
      await live.destroy();
      const again = spawnSync("npm", ["run", "--silent", "db:backup", "--", path.join(dir, "copy.sqlite")], { encoding: "utf8", env });
      expect(again.status).not.toBe(0);
      expect(again.stderr).toMatch(/exists already/);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
