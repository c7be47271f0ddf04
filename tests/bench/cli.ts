// Starting the command line: `--help` from the compiled, split bundle (what `npm run cli` runs after `npm run build`)
// beside the same command from the TypeScript sources through tsx (what it ran before), and beside the named peers'
// own start-up: python3 importing pandas and scipy.optimize (the pandas+scipy route) — each the median of five, in
// the same run. Whole-process fit and ingest of 1e6 points are in the `ingest` part.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { DEBIAN_PYTHON } from "../helpers/python";

function median(cmd: string, args: string[]): number | null {
  const times: number[] = [];
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    const r = spawnSync(cmd, args, { encoding: "utf8" });
    if (r.status !== 0) return null;
    times.push(performance.now() - t0);
  }
  return times.sort((a, b) => a - b)[2]!;
}

export function benchCli(): void {
  console.log("\nStarting the command line (median of five, whole process)");
  const bundle = path.resolve("dist/cli/main.mjs");
  const row = (label: string, ms: number | null) => console.log(`  ${label.padEnd(60)} ${ms === null ? "not available" : `${ms.toFixed(0).padStart(6)} ms`}`);
  if (!fs.existsSync(bundle)) console.log("  (no bundle: run npm run build:server first)");
  const compiled = fs.existsSync(bundle) ? median(process.execPath, ["--input-type=module", "-e", `const m = await import(${JSON.stringify(`file://${bundle}`)}); const r = await m.runCli(["--help"]); process.stdout.write(r.out ?? "");`]) : null;
  row("cli --help, compiled bundle (node)", compiled);
  const tsx = median(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), "lib/cli/main.ts", "--help"]);
  row("cli --help, TypeScript sources through tsx (before)", tsx);
  row("peer: python3 -c 'import pandas, scipy.optimize' (Debian's)", median(DEBIAN_PYTHON, ["-c", "import pandas, scipy.optimize"]));
  row("peer: python3 -c 'import scipy.optimize' (Debian's)", median(DEBIAN_PYTHON, ["-c", "import scipy.optimize"]));
  row("node itself (an empty script)", median(process.execPath, ["-e", "0"]));
  if (compiled !== null && tsx !== null) console.log(`  ratio tsx / bundle: ${(tsx / compiled).toFixed(1)}×`);
}
