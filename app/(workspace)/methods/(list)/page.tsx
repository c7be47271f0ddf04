import type { Metadata } from "next";
import Link from "next/link";
import { buttonLinkClass } from "@/components/ui/button";
import { MethodList } from "@/components/methods/lists";
import { MethodsNav } from "@/components/methods/methods-nav";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { listMethods } from "@/lib/methods";
import { can } from "@/lib/permissions";
import { listQuerySchema } from "@/lib/schemas/methods";

export const metadata: Metadata = { title: "Methods" };

export default async function MethodsPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const user = await requirePageUser("method:read", "/methods");
  const q = listQuerySchema.parse({ sort: "name", dir: "asc", ...(await searchParams) });
  const list = await listMethods(await getDb(), user.labId, q);
  return (
    <>
      <PageHeader
        title="Methods"
        lede="How each kind of run must be evaluated: wavelength, concentration from ε or a calibration, models, window and the acceptance criteria every fit is judged against."
        actions={can(user, "method:write") ? <Link href="/methods/new" className={buttonLinkClass("primary")}>New method</Link> : undefined}
      />
      <MethodsNav current="methods" />
      <MethodList rows={list.rows} state={{ total: list.total, page: q.page, pageSize: q.pageSize, sort: q.sort, dir: q.dir, q: q.q }} />
    </>
  );
}
