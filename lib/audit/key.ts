// The audit key: HMAC key of the audit chain, kept apart from the data, so a copy of the database cannot re-hash the
// trail unnoticed. AUDIT_KEY (at least 32 characters) in production; for the demo and development one is generated
// once into HALFLIGHT_KEY_DIR (default ~/.halflight), never beside the database file; a production start without it
// is a clear error.
import { createHmac } from "node:crypto";
import { generatedKey, keysMayBeGenerated } from "@/lib/auth/secret";

let cached: Buffer | undefined;

export function auditKey(): Buffer {
  if (cached) return cached;
  const fromEnv = process.env.AUDIT_KEY;
  if (fromEnv) {
    if (fromEnv.length < 32) throw new Error("AUDIT_KEY must have at least 32 characters (for example: openssl rand -base64 32).");
    cached = Buffer.from(fromEnv, "utf8");
    return cached;
  }
  if (!keysMayBeGenerated()) throw new Error("AUDIT_KEY is not set. Set it to a long random value kept apart from the data (for example: openssl rand -base64 32) before starting Halflight.");
  cached = Buffer.from(generatedKey("audit.key"), "utf8");
  return cached;
}

export function auditMac(text: string, key: Buffer = auditKey()): string {
  return createHmac("sha256", key).update(text).digest("hex");
}

/** The head's MAC binds the row count, the newest row and its hash: truncation or a rewritten head no longer match. */
export function headMac(count: number, headId: number | null, headHash: string | null, key: Buffer = auditKey()): string {
  return auditMac(`audit-head|${count}|${headId ?? ""}|${headHash ?? ""}`, key);
}
