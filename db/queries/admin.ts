// Lab settings, invitations and instrument API keys.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbApiKeyRow, DbInvitationRow, DbLabSettingsRow } from "@/db/tables";

export async function getLabSettingsRow(db: Db, labId: number): Promise<DbLabSettingsRow | undefined> {
  return db("lab_settings").where({ lab_id: labId }).first();
}

export async function upsertLabSettings(db: Db, row: DbLabSettingsRow): Promise<void> {
  await db("lab_settings").insert(row).onConflict("lab_id").merge();
}

export async function insertInvitation(db: Db, row: Omit<DbInvitationRow, "id">): Promise<number> {
  const [r] = await db("invitations").insert(row).returning("id");
  return insertedId(r);
}

export async function findInvitationByTokenHash(db: Db, tokenHash: string): Promise<DbInvitationRow | undefined> {
  return db("invitations").where({ token_hash: tokenHash }).first();
}

export async function findInvitation(db: Db, labId: number, id: number): Promise<DbInvitationRow | undefined> {
  return db("invitations").where({ lab_id: labId, id }).first();
}

export async function listInvitationRows(db: Db, labId: number) {
  return db("invitations as i")
    .leftJoin("users as u", "u.id", "i.invited_by")
    .where("i.lab_id", labId)
    .orderBy("i.created_at", "desc")
    .select("i.id", "i.email", "i.display_name", "i.role", "i.expires_at", "i.accepted_at", "i.revoked_at", "i.created_at", "u.display_name as invited_by_name");
}

export async function markInvitation(db: Db, id: number, change: Partial<Pick<DbInvitationRow, "accepted_at" | "revoked_at" | "user_id">>): Promise<number> {
  // Only an open invitation changes: a second acceptance of the same link finds nothing to update.
  return db("invitations").where({ id }).whereNull("accepted_at").whereNull("revoked_at").update(change);
}

export async function insertApiKey(db: Db, row: Omit<DbApiKeyRow, "id">): Promise<number> {
  const [r] = await db("api_keys").insert(row).returning("id");
  return insertedId(r);
}

export async function findApiKeyByHash(db: Db, keyHash: string): Promise<DbApiKeyRow | undefined> {
  return db("api_keys").where({ key_hash: keyHash }).first();
}

export async function findApiKey(db: Db, labId: number, id: number): Promise<DbApiKeyRow | undefined> {
  return db("api_keys").where({ lab_id: labId, id }).first();
}

export async function listApiKeyRows(db: Db, labId: number) {
  return db("api_keys as k")
    .leftJoin("users as u", "u.id", "k.created_by")
    .where("k.lab_id", labId)
    .orderBy("k.created_at", "desc")
    .select("k.id", "k.name", "k.prefix", "k.created_at", "k.last_used_at", "k.revoked_at", "u.display_name as created_by_name");
}

export async function revokeApiKeyRow(db: Db, id: number, at: string): Promise<void> {
  await db("api_keys").where({ id }).whereNull("revoked_at").update({ revoked_at: at });
}

export async function touchApiKey(db: Db, id: number, at: string): Promise<void> {
  await db("api_keys").where({ id }).update({ last_used_at: at });
}
