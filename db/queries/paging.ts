// One page of a list query: the total, then the rows sorted (with a tie-breaker so pages never overlap), limited and
// offset. The caller builds the filtered query and names the sort column from its own allow-list.
import type { Knex } from "knex";

export interface PageQuery {
  q?: string;
  sort: string;
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}

export async function pageOf<Row>(base: Knex.QueryBuilder, q: PageQuery, order: { column: string; tie: string }, extend: (b: Knex.QueryBuilder) => Knex.QueryBuilder): Promise<{ rows: Row[]; total: number }> {
  const [{ count }] = (await base.clone().clearSelect().count({ count: "*" })) as [{ count: number | string }];
  const rows = (await extend(base.clone())
    .orderBy(order.column, q.dir)
    .orderBy(order.tie, q.dir)
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)) as Row[];
  return { rows, total: Number(count) };
}
