// Labs: a lab is a workspace; every other row belongs to one.
import type { Db } from "@/db";
import type { DbLabRow } from "@/db/tables";

export async function insertLab(db: Db, lab: { slug: string; name: string; createdAt: string }): Promise<DbLabRow> {
  const [row] = await db("labs").insert({ slug: lab.slug, name: lab.name, created_at: lab.createdAt }).returning("*");
  return row as DbLabRow;
}

export async function findLabBySlug(db: Db, slug: string): Promise<DbLabRow | undefined> {
  return db("labs").where({ slug }).first();
}

export async function listLabs(db: Db): Promise<DbLabRow[]> {
  return db("labs").orderBy("id");
}

export async function countLabs(db: Db): Promise<number> {
  const row = await db("labs").count<{ n: number | string }[]>({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

export async function findLabById(db: Db, id: number): Promise<DbLabRow | undefined> {
  return db("labs").where({ id }).first();
}
