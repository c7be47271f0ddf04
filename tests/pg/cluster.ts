// A throw-away PostgreSQL cluster for the test suite: Debian's postgresql binaries, initdb in a temporary folder, its
// own port and socket folder, trust authentication on 127.0.0.1 only, durability off (it is deleted after the run).
// As root the server runs as the "postgres" user (initdb refuses root).
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

export function postgresBin(): string {
  const base = "/usr/lib/postgresql";
  const versions = fs.existsSync(base) ? fs.readdirSync(base).filter((v) => fs.existsSync(path.join(base, v, "bin", "initdb"))).sort((a, b) => Number(b) - Number(a)) : [];
  if (!versions.length) throw new Error("PostgreSQL is not installed: the suite runs on SQLite and on PostgreSQL. Install Debian's postgresql package (apt-get install postgresql); .ci/run does.");
  return path.join(base, versions[0]!, "bin");
}

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

export interface Cluster {
  url: string;
  stop(): void;
}

export async function startCluster(): Promise<Cluster> {
  const bin = postgresBin();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-pg-"));
  const data = path.join(dir, "data");
  const asRoot = process.getuid?.() === 0;
  const run = (cmd: string, args: string[]) => {
    const full = asRoot ? ["runuser", ["-u", "postgres", "--", path.join(bin, cmd), ...args]] : [path.join(bin, cmd), args];
    const r = spawnSync(full[0] as string, full[1] as string[], { encoding: "utf8" });
    if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.stdout}`);
  };
  if (asRoot) execFileSync("chown", ["postgres", dir]);
  run("initdb", ["-D", data, "-U", "halflight", "-A", "trust", "-E", "UTF8", "--no-locale", "--no-sync"]);
  const port = await freePort();
  const opts = [`-p ${port}`, `-k ${dir}`, "-c listen_addresses=127.0.0.1", "-c fsync=off", "-c synchronous_commit=off", "-c full_page_writes=off", "-c max_connections=400"].join(" ");
  run("pg_ctl", ["-D", data, "-o", opts, "-l", path.join(dir, "server.log"), "-w", "start"]);
  return {
    url: `postgres://halflight@127.0.0.1:${port}/postgres`,
    stop() {
      try {
        run("pg_ctl", ["-D", data, "-m", "immediate", "-w", "stop"]);
      } finally {
        fs.rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}
