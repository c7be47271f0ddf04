// A 1,000,000-point series read for fitting: the binary endpoint's work (the stored little-endian float64 BLOBs sent as
// they are) beside the JSON of every point that the series view used to offer (?full=1, removed), in the same run:
// time, memory growth, and the longest stall of the event loop while it runs (what any other request on the server,
// such as /api/me, waits at worst). Also the display view (decimated to 2,000 points) and the decimator on its own.
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import { insertRawFile, insertRun, insertSeries, packF64 } from "@/db/queries/runs";
import { readSeries, seriesBinary, seriesForDisplay } from "@/lib/runs";
import { decimate } from "@/lib/plot/decimate";
import { mb, measure } from "./measure";

const N = 1_000_000;

export async function benchSeries(): Promise<void> {
  const db = openDb(":memory:");
  await migrateToLatest(db);
  await seedDemoWhenEmpty(db);
  const labId = (await db("labs").first("id"))!.id as number;
  const raw = await insertRawFile(db, { lab_id: labId, sha256: "0".repeat(64), name: "bench.csv", size: 1, bytes: Buffer.from("x"), stored_in: "database", uploaded_by: null, uploaded_at: new Date().toISOString() });
  const t = Float64Array.from({ length: N }, (_, i) => i * 0.1);
  const y = Float64Array.from({ length: N }, (_, i) => 0.05 + 0.9 * Math.exp(-i / 300_000) + 1e-3 * Math.sin(i));
  const at = new Date().toISOString();
  const runId = await insertRun(db, { lab_id: labId, raw_file_id: raw, name: "bench 1M", parser: "delimited", study: null, wavelength_nm: 590, path_length_cm: 1, temperature_c: 25, cell: null, operator: null, sample: null, method: null, method_record_id: null, dilution_factor: null, metadata: "{}", warnings: "[]", created_by: null, created_at: at });
  const seriesId = await insertSeries(db, { lab_id: labId, run_id: runId, position: 0, name: "A", source_column: "A", quantity: "absorbance", unit: "AU", point_count: N, t_f64: packF64(t), y_f64: packF64(y), t_min: 0, t_max: t[N - 1]!, skipped_lines: "[]", processing: "{}" });

  console.log(`\nA ${N.toLocaleString("en")}-point series read for fitting (in-process SQLite; 'stall' = longest event-loop delay meanwhile)`);
  const row = async (label: string, f: () => Promise<string>) => {
    // The longest gap between ticks of a 1 ms timer while the work runs: how long another request would wait.
    let last = performance.now(),
      stall = 0;
    const tick = setInterval(() => {
      const now = performance.now();
      stall = Math.max(stall, now - last);
      last = now;
    }, 1);
    await new Promise((res) => setTimeout(res, 5));
    const r = await measure(f);
    await new Promise((res) => setTimeout(res, 5));
    clearInterval(tick);
    console.log(`  ${label.padEnd(52)} ${r.ms.toFixed(0).padStart(6)} ms   RSS +${mb(r.rss).padStart(9)}   stall ${stall.toFixed(0).padStart(5)} ms   ${r.value}`);
    return r.ms;
  };
  const bin = await row("binary: stored BLOBs as they are (…/points)", async () => {
    const s = await seriesBinary(db, labId, runId, seriesId);
    const body = new Blob([new Uint8Array(s.t), new Uint8Array(s.y)]);
    return `${mb(body.size)} sent`;
  });
  const json = await row("peer: JSON of every point (the former ?full=1)", async () => {
    const { t: tt, y: yy } = await readSeries(db, labId, runId, seriesId);
    const body = JSON.stringify({ t: Array.from(tt), y: Array.from(yy) });
    return `${mb(Buffer.byteLength(body))} sent`;
  });
  console.log(`  ratio JSON / binary: ${(json / bin).toFixed(1)}×`);
  await row("display view: decimated to 2,000 points (JSON)", async () => {
    const s = await seriesForDisplay(db, labId, runId, seriesId, { maxPoints: 2000 });
    return `${s.t.length} points, ${mb(Buffer.byteLength(JSON.stringify(s)))}`;
  });
  await row("decimator alone (1,000 columns)", async () => `${decimate(t, y, 1000).x.length} points kept`);
  await db.destroy();
}
