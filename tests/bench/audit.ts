// Verifying a long audit trail: 200,000 keyed rows in a SQLite file, verified in pages by verifyAuditTrail; beside it
// the peer, loading every row at once (what verification did before), in the same run. Prints time and memory growth.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { rowHash, verifyAuditTrail } from "@/lib/audit";
import { auditMac, headMac } from "@/lib/audit/key";
import { mb, measure } from "./measure";

const ROWS = 200_000;

export async function benchAudit(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-audit-bench-"));
  const db = openDb(path.join(dir, "audit.sqlite"));
  await migrateToLatest(db);
  console.log(`\nAudit trail verification: ${ROWS.toLocaleString("en")} keyed rows`);
  let prev: string | null = null;
  const at = new Date().toISOString();
  let lastId = 0;
  for (let start = 0; start < ROWS; start += 1000) {
    const batch = [];
    for (let i = start; i < Math.min(ROWS, start + 1000); i++) {
      const fields = { lab_id: null, actor_user_id: null, actor_label: "bench", at, action: "bench.event", object_type: "fit", object_id: String(i), object_version: 1, old_values: null, new_values: JSON.stringify({ i, k: 0.0048 }), reason: "a reason of ordinary length for an audit row", prev_hash: prev };
      const hash = rowHash(fields);
      batch.push({ ...fields, hash, mac: auditMac(hash) });
      prev = hash;
    }
    await db.batchInsert("audit_events", batch, 200);
  }
  lastId = (await db("audit_events").max({ m: "id" }))[0]!.m as number;
  const count = Number((await db("audit_events").count({ n: "*" }))[0]!.n);
  await db("audit_head").where({ id: 1 }).update({ row_count: count, head_id: lastId, head_hash: prev, mac: headMac(count, lastId, prev) });

  const ours = await measure(() => verifyAuditTrail(db));
  console.log(`  verifyAuditTrail (pages of 5,000)    ${ours.ms.toFixed(0).padStart(6)} ms   RSS +${mb(ours.rss)}   heap +${mb(ours.heap)}   intact: ${ours.value.intact} (${ours.value.rows} rows)`);
  const peer = await measure(async () => {
    const all = await db("audit_events").orderBy("id", "asc");
    let p: string | null = null;
    for (const r of all) {
      const { id: _id, hash, mac: _mac, ...fields } = r;
      if (fields.prev_hash !== p || rowHash(fields) !== hash) return false;
      p = hash;
    }
    return true;
  });
  console.log(`  peer: every row loaded at once       ${peer.ms.toFixed(0).padStart(6)} ms   RSS +${mb(peer.rss)}   heap +${mb(peer.heap)}   (no MAC or head checks)`);
  console.log(`  memory ratio (ours / peer, RSS growth): ${(ours.rss / Math.max(1, peer.rss)).toFixed(2)}`);
  await db.destroy();
  fs.rmSync(dir, { recursive: true, force: true });
}
