// Instrument API keys: scoped to one lab, shown once at creation (only the SHA-256 is stored), revocable, with the last
// time each was used; requests are rate-limited per key.
import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { findApiKey, findApiKeyByHash, insertApiKey, listApiKeyRows, revokeApiKeyRow, touchApiKey } from "@/db/queries/admin";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { countFailure, refuseIfOver, takeOrRefuse } from "@/lib/http/rate-limit";

const KEY_PREFIX = "hlk_";
const hashKey = (k: string) => createHash("sha256").update(k).digest("hex");

export async function createApiKey(db: Knex, admin: SignedInUser, name: string) {
  const secret = KEY_PREFIX + randomBytes(24).toString("base64url");
  const prefix = secret.slice(0, 10);
  const at = new Date().toISOString();
  const id = await db.transaction(async (trx) => {
    const keyId = await insertApiKey(trx, { lab_id: admin.labId, name, prefix, key_hash: hashKey(secret), created_by: admin.userId, created_at: at, last_used_at: null, revoked_at: null });
    await recordAudit(trx, { labId: admin.labId, actorUserId: admin.userId, action: "api_key.created", objectType: "api_key", objectId: keyId, newValues: { name, prefix } });
    return keyId;
  });
  // The key itself is returned once, here.
  return { id, name, prefix, key: secret, created_at: at };
}

export async function listApiKeys(db: Knex, labId: number) {
  return (await listApiKeyRows(db, labId)).map((k) => ({ id: k.id, name: k.name, prefix: k.prefix, created_at: k.created_at, created_by: k.created_by_name, last_used_at: k.last_used_at, revoked_at: k.revoked_at }));
}

export async function revokeApiKey(db: Knex, admin: SignedInUser, id: number) {
  const k = await findApiKey(db, admin.labId, id);
  if (!k) throw new AppError({ code: "not_found", message: `There is no API key ${id} in this lab.` });
  if (k.revoked_at) return { revoked_at: k.revoked_at };
  const at = new Date().toISOString();
  await db.transaction(async (trx) => {
    await revokeApiKeyRow(trx, id, at);
    await recordAudit(trx, { labId: admin.labId, actorUserId: admin.userId, action: "api_key.revoked", objectType: "api_key", objectId: id, newValues: { name: k.name, prefix: k.prefix } });
  });
  return { revoked_at: at };
}

/**
 * The lab and key behind an `Authorization: Bearer …` header; 401 for a missing, unknown or revoked key, 429 when
 * over the key's rate or when the address has sent too many refused keys (both counted in the database, shared by
 * every server process).
 */
export async function authenticateApiKey(db: Knex, authorization: string | null, address = "unknown") {
  const who = `address ${address}`;
  await refuseIfOver(db, "apiKeyFailuresByAddress", who);
  const refuse = async (message: string) => {
    await countFailure(db, "apiKeyFailuresByAddress", who);
    return new AppError({ code: "unauthorized", message });
  };
  const m = authorization?.match(/^Bearer\s+(\S+)\s*$/i);
  if (!m) throw await refuse("Send an instrument API key as `Authorization: Bearer <key>`.");
  const k = await findApiKeyByHash(db, hashKey(m[1]!));
  if (!k) throw await refuse("This API key is not known.");
  if (k.revoked_at) throw await refuse(`This API key was revoked on ${k.revoked_at.slice(0, 16).replace("T", " ")} UTC.`);
  await takeOrRefuse(db, "apiKeyRequests", `API key ${k.prefix}`, k.lab_id);
  await touchApiKey(db, k.id, new Date().toISOString());
  return { keyId: k.id, labId: k.lab_id, name: k.name, prefix: k.prefix };
}
