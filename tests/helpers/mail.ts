// The local SMTP sink for a test file: started on a free port, SMTP_URL and NEXTAUTH_URL pointed at it and the test
// host; `stop` puts the environment back.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { startMailSink } from "@/lib/mail/sink";

export async function testMailSink(prefix: string) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `halflight-${prefix}-`));
  const sink = await startMailSink(dir);
  process.env.SMTP_URL = `smtp://127.0.0.1:${sink.port}`;
  process.env.NEXTAUTH_URL = "http://halflight.test";
  return {
    dir,
    stop: async () => {
      delete process.env.SMTP_URL;
      await sink.close();
    },
  };
}
