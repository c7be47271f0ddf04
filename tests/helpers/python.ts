// Runs a reference script on Debian's python3 (where python3-scipy lives; .ci/run installs it).
import { spawnSync } from "node:child_process";

export const DEBIAN_PYTHON = process.env.REFERENCE_PYTHON ?? "/usr/bin/python3";

export function runPython<T>(script: string, input: unknown): T {
  const r = spawnSync(DEBIAN_PYTHON, [script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 256 * 1024 * 1024 });
  if (r.error) throw new Error(`${DEBIAN_PYTHON} could not be started (${r.error.message}); install Debian's python3-scipy`);
  if (r.status !== 0) throw new Error(`${script} failed:\n${r.stderr}`);
  return JSON.parse(r.stdout) as T;
}
