// `npm run test:pg`: the unit and integration suite again, on PostgreSQL (a throw-away cluster started here, a fresh
// database per test file's freshDb()). Arguments go to vitest.
import { spawnSync } from "node:child_process";
import { startCluster } from "./cluster";

async function main() {
  const cluster = await startCluster();
  let code = 1;
  try {
    console.log(`PostgreSQL test cluster at ${cluster.url}`);
    const r = spawnSync(process.execPath, ["node_modules/vitest/vitest.mjs", "run", ...process.argv.slice(2)], { stdio: "inherit", env: { ...process.env, DATABASE_URL: cluster.url } });
    code = r.status ?? 1;
  } finally {
    cluster.stop();
  }
  process.exit(code);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
