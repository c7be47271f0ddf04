// The demo's mail sink, read back for the admin's Demo inbox page (only where MAIL_SINK_DIR is set).
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";

export async function readSinkInbox(limit = 50) {
  const dir = process.env.MAIL_SINK_DIR;
  if (!dir || !fs.existsSync(dir)) return null;
  const files = fs.readdirSync(dir).filter((f) => f.endsWith(".eml")).sort().reverse().slice(0, limit);
  return Promise.all(
    files.map(async (f) => {
      const m = await simpleParser(fs.readFileSync(path.join(dir, f)));
      const to = Array.isArray(m.to) ? m.to.map((x) => x.text).join(", ") : (m.to?.text ?? "");
      return { file: f, to, subject: m.subject ?? "", date: m.date?.toISOString() ?? "", text: m.text ?? "" };
    }),
  );
}
