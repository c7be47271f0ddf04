// Engine benchmark: first-order fits of 1e3..1e6 points, our engine in-process beside scipy curve_fit (trf, analytic
// Jacobian) on the same data in the same run; then the whole `cli fit` of a 1e6-point CSV beside pandas.read_csv +
// curve_fit. Prints medians and ratios (ours / peer; below 1 means faster).
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fitKinetics, fitSeriesWithOptions } from "@/lib/kinetics";
import { seededRandom } from "../helpers/random";
import { DEBIAN_PYTHON } from "../helpers/python";

function trace(n: number, seed: number) {
  const rnd = seededRandom(seed);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const k = 3e-3,
    a0 = 1.05,
    ainf = 0.06,
    span = (4 * Math.LN2) / k;
  for (let i = 0; i < n; i++) {
    t[i] = (span * i) / (n - 1);
    y[i] = ainf + (a0 - ainf) * Math.exp(-k * t[i]!) + 0.004 * rnd.normal();
  }
  return { t, y };
}

const median = (a: number[]) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)]!;

export function benchEngine(): void {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-bench-"));
  const sizes = [1e3, 1e4, 1e5, 1e6];
  const cases = sizes.map((n, i) => {
    const { t, y } = trace(n, 100 + i);
    const tf = path.join(dir, `t${n}.f64`),
      yf = path.join(dir, `y${n}.f64`);
    fs.writeFileSync(tf, Buffer.from(t.buffer));
    fs.writeFileSync(yf, Buffer.from(y.buffer));
    return { n, t, y, tf, yf, repeats: n >= 1e6 ? 5 : n >= 1e5 ? 7 : 15 };
  });
  const peer = spawnSync(DEBIAN_PYTHON, ["tests/bench/scipy_first_order_bench.py"], {
    input: JSON.stringify({ cases: cases.map((c) => ({ n: c.n, t: c.tf, y: c.yf, repeats: c.repeats, p0: [c.y[0], c.y[c.n - 1], 1 / (c.t[c.n - 1]! - c.t[0]!)] })) }),
    encoding: "utf8",
    maxBuffer: 1 << 26,
  });
  const scipy = peer.status === 0 ? (JSON.parse(peer.stdout) as Record<string, { median_s: number; k: number }>) : null;
  if (!scipy) console.log(`(scipy peer unavailable: ${peer.stderr || peer.error?.message}; install Debian's python3-scipy)`);

  console.log("\nFirst-order fit, in-process (median seconds; ratio = Halflight / scipy curve_fit trf)");
  console.log("      n   Halflight       scipy   ratio   k (ours)      k (scipy)");
  for (const c of cases) {
    // Warm-up, as the peer does: a server fits many series, so small fits are timed with the JIT warm (20 calls up to
    // 10,000 points, one call above).
    for (let w = 0; w < (c.n <= 1e4 ? 20 : 1); w++) fitKinetics(c.t, c.y, { model: "first-order" });
    const times: number[] = [];
    let k = NaN;
    for (let r = 0; r < c.repeats; r++) {
      const t0 = performance.now();
      const res = fitKinetics(c.t, c.y, { model: "first-order" });
      times.push((performance.now() - t0) / 1000);
      k = res.parameters[2]!.value!;
    }
    const ours = median(times);
    const s = scipy?.[String(c.n)];
    console.log(
      `${String(c.n).padStart(7)}  ${ours.toFixed(4).padStart(10)}  ${s ? s.median_s.toFixed(4).padStart(10) : "       n/a"}  ${s ? (ours / s.median_s).toFixed(2).padStart(6) : "   n/a"}   ${k.toPrecision(10)}  ${s ? s.k.toPrecision(10) : ""}`,
    );
  }

  // The fitting page's re-fit: both default models (linearized and nonlinear first order) over 10k points, as the
  // workspace runs it on every change of the options (here under Node; the browser runs the same code).
  {
    const { t, y } = trace(10_000, 7);
    const opts = { models: ["linearized", "first-order"] };
    fitSeriesWithOptions(t, y, opts);
    const times: number[] = [];
    for (let r = 0; r < 15; r++) {
      const t0 = performance.now();
      fitSeriesWithOptions(t, y, { ...opts, exclusions: [{ index: r, reason: "bench" }] });
      times.push(performance.now() - t0);
    }
    console.log(`\nWorkspace re-fit, 10,000 points, linearized + nonlinear first order: median ${median(times).toFixed(1)} ms (target: under 100 ms)`);
  }

  // Whole command: read a 1e6-point CSV, parse, fit, print.
  const big = cases.at(-1)!;
  const csv = path.join(dir, "first-order-1e6.csv");
  const lines = ["Time (s),A"];
  for (let i = 0; i < big.n; i++) lines.push(`${big.t[i]!.toPrecision(10)},${big.y[i]!.toPrecision(8)}`);
  fs.writeFileSync(csv, lines.join("\n") + "\n");
  const mb = fs.statSync(csv).size / 1e6;
  const timeCmd = (cmd: string, args: string[]) => {
    const t0 = performance.now();
    const r = spawnSync(cmd, args, { encoding: "utf8", maxBuffer: 1 << 26 });
    return { s: (performance.now() - t0) / 1000, ok: r.status === 0, err: r.stderr };
  };
  const oursCli = [0, 1, 2].map(() => timeCmd("npm", ["run", "--silent", "cli", "--", "fit", csv, "--model", "first-order", "--json"]));
  const oursNode = [0, 1, 2].map(() => timeCmd(process.execPath, ["lib/cli/launch.mjs", "fit", csv, "--model", "first-order", "--json"]));
  const peerCli = [0, 1, 2].map(() => timeCmd(DEBIAN_PYTHON, ["tests/bench/pandas_cli_fit.py", csv]));
  const o = median(oursCli.map((r) => r.s));
  console.log(`\nWhole command on a 1e6-point CSV (${mb.toFixed(1)} MB), median of 3 (wall clock, process start included)`);
  console.log(`  cli fit (npm run --silent cli -- fit FILE --model first-order --json): ${o.toFixed(2)} s${oursCli[0]!.ok ? "" : " FAILED: " + oursCli[0]!.err}`);
  if (peerCli.every((r) => r.ok)) {
    const p = median(peerCli.map((r) => r.s));
    console.log(`  python3 pandas.read_csv + curve_fit:                                  ${p.toFixed(2)} s`);
    console.log(`  ratio (cli / pandas+scipy): ${(o / p).toFixed(2)}`);
    const n = median(oursNode.map((r) => r.s));
    console.log(`  node lib/cli/launch.mjs fit … (the command without npm's own start): ${n.toFixed(2)} s, ratio ${(n / p).toFixed(2)} (target 1.0)`);
  } else console.log(`  pandas peer unavailable (${peerCli[0]!.err.trim().split("\n").at(-1)}); install Debian's python3-pandas`);
  fs.rmSync(dir, { recursive: true, force: true });
}
