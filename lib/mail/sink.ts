// A local SMTP sink for the demo and the tests (smtp-server from npm): every message is saved as an .eml file.
import fs from "node:fs";
import path from "node:path";
import { SMTPServer } from "smtp-server";

export async function startMailSink(dir: string, port = 0): Promise<{ port: number; close: () => Promise<void> }> {
  fs.mkdirSync(dir, { recursive: true });
  let n = fs.readdirSync(dir).length;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        n += 1;
        fs.writeFileSync(path.join(dir, `${String(n).padStart(5, "0")}.eml`), Buffer.concat(chunks));
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", () => resolve()));
  const address = server.server.address();
  return { port: typeof address === "object" && address ? address.port : port, close: () => new Promise((r) => server.close(() => r())) };
}
