// Share links and their views.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbShareLinkRow } from "@/db/tables";

export async function insertShareLink(db: Db, row: Omit<DbShareLinkRow, "id">): Promise<number> {
  const [r] = await db("share_links").insert(row).returning("id");
  return insertedId(r);
}

export async function findShareLinkByTokenHash(db: Db, tokenSha256: string): Promise<DbShareLinkRow | undefined> {
  return db("share_links").where({ token_sha256: tokenSha256 }).first();
}

export async function findShareLink(db: Db, labId: number, id: number): Promise<DbShareLinkRow | undefined> {
  return db("share_links").where({ lab_id: labId, id }).first();
}

/** Revokes a link that is still open, as one conditional statement: true when this call revoked it. */
export async function revokeShareLink(db: Db, id: number, userId: number, at: string): Promise<boolean> {
  return (await db("share_links").where({ id }).whereNull("revoked_at").update({ revoked_at: at, revoked_by: userId })) === 1;
}

export async function insertShareView(db: Db, shareLinkId: number, viewerId: number, at: string): Promise<void> {
  await db("share_views").insert({ share_link_id: shareLinkId, viewer_id: viewerId, viewed_at: at });
}

export async function shareLinksOf(db: Db, labId: number, objectType: string, objectId: number) {
  return db("share_links as l")
    .leftJoin("share_views as v", "v.share_link_id", "l.id")
    .where({ "l.lab_id": labId, "l.object_type": objectType, "l.object_id": objectId })
    .groupBy("l.id")
    .orderBy("l.id", "desc")
    .select("l.id", "l.recipient", "l.expires_at", "l.revoked_at", "l.created_at", db.raw("count(v.id) as views"));
}
