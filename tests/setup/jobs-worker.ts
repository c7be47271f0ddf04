// The unit suite's global set-up: builds the job workers' bundle (dist/jobs-worker.mjs, as npm run build does), so the
// services under test hand their fits and parses to real worker threads.
import { build } from "esbuild";

export async function setup(): Promise<void> {
  await build({ entryPoints: ["lib/jobs/worker.ts"], bundle: true, platform: "node", target: "node20", format: "esm", packages: "external", outfile: "dist/jobs-worker.mjs", logLevel: "warning" });
}
