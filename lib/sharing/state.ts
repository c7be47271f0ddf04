// A share link's state for the page's status code (410 when over, 404 when unknown), read without logging a view.
import { createHash } from "node:crypto";
import type { Db } from "@/db";
import { findShareLinkByTokenHash } from "@/db/queries/sharing";

export async function shareLinkState(db: Db, token: string, now = new Date()): Promise<"open" | "gone" | "missing"> {
  if (!/^[A-Za-z0-9_-]{16,128}$/.test(token)) return "missing";
  const l = await findShareLinkByTokenHash(db, createHash("sha256").update(token).digest("hex"));
  if (!l) return "missing";
  return l.revoked_at || Date.parse(l.expires_at) <= now.getTime() ? "gone" : "open";
}
