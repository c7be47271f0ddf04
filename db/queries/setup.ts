// First-run tokens: issued when the database has no lab, used once inside the transaction that creates the lab.
import { insertedId } from "./ids";
import type { Db } from "@/db";

export async function insertSetupToken(db: Db, tokenSha256: string, createdAt: string, expiresAt: string): Promise<number> {
  const [r] = await db("setup_tokens").insert({ token_sha256: tokenSha256, created_at: createdAt, expires_at: expiresAt, used_at: null }).returning("id");
  return insertedId(r);
}

/** Uses an open token as one conditional statement: true when this call used it. */
export async function useSetupToken(db: Db, tokenSha256: string, nowIso: string): Promise<boolean> {
  return (await db("setup_tokens").where({ token_sha256: tokenSha256 }).whereNull("used_at").where("expires_at", ">", nowIso).update({ used_at: nowIso })) === 1;
}
