// Hostile input refused early: a 60 MB upload with its length declared, the same body streamed with no length, and a
// CSV of 1,000,000 columns, each through the code the routes use (formOf, parseExport); beside each the peer that
// reads first and checks after (Request.formData() on the whole body; papaparse on the whole file), in the same run.
import Papa from "papaparse";
import { formOf } from "@/lib/http/multipart";
import { parseExport } from "@/parsers";
import { mb, measure } from "./measure";

const BODY_MB = 60;
const LIMIT = 50 * 1048576;

function sixtyMegabytes(declare: boolean): Request {
  const boundary = "halflightbench";
  const head = new TextEncoder().encode(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\nContent-Type: text/csv\r\n\r\n`);
  const tail = new TextEncoder().encode(`\r\n--${boundary}--\r\n`);
  const chunk = new TextEncoder().encode("0,0.5\n".repeat(10_923)); // ~64 KiB of rows
  const chunks = Math.ceil((BODY_MB * 1048576) / chunk.byteLength);
  let sent = -1;
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      if (sent === -1) c.enqueue(head);
      else if (sent < chunks) c.enqueue(chunk.slice()); // a fresh buffer per chunk, as from a socket
      else if (sent === chunks) c.enqueue(tail);
      else c.close();
      sent++;
    },
  });
  const length = head.byteLength + chunks * chunk.byteLength + tail.byteLength;
  return new Request("http://bench.local/api/runs", {
    method: "POST",
    headers: { "content-type": `multipart/form-data; boundary=${boundary}`, ...(declare ? { "content-length": String(length) } : {}) },
    body,
    duplex: "half",
  } as RequestInit);
}

const outcome = (p: Promise<unknown>) => p.then(() => "read whole", (e: Error) => e.message.slice(0, 60));

export async function benchLimits(): Promise<void> {
  console.log(`\nHostile input: a ${BODY_MB} MB upload against a 50 MB limit, and a 1,000,000-column CSV`);
  const row = (label: string, r: { ms: number; rss: number; value: string }) =>
    console.log(`  ${label.padEnd(44)} ${r.ms.toFixed(0).padStart(7)} ms   RSS +${mb(r.rss).padStart(9)}   ${r.value}`);
  row("formOf, length declared (413 before reading)", await measure(() => outcome(formOf(sixtyMegabytes(true), LIMIT))));
  row("formOf, no length (read to the limit)", await measure(() => outcome(formOf(sixtyMegabytes(false), LIMIT))));
  row("peer: Request.formData() on the whole body", await measure(() => outcome(sixtyMegabytes(true).formData())));

  const wide = new TextEncoder().encode("t," + Array.from({ length: 1_000_000 }, (_, i) => `c${i}`).join(",") + "\n0," + "0.5,".repeat(999_999) + "0.5\n");
  console.log(`  (the CSV is ${mb(wide.byteLength)})`);
  row("parseExport (refused at line 1)", await measure(() => {
    const r = parseExport(wide, "wide.csv");
    return r instanceof Error ? r.message.slice(0, 60) : "parsed";
  }));
  row("peer: papaparse on the whole file", await measure(() => {
    const r = Papa.parse<string[]>(new TextDecoder().decode(wide));
    return `${r.data.length} rows × ${r.data[0]!.length.toLocaleString("en")} cells`;
  }));
}
