import type { Metadata } from "next";
import Link from "next/link";
import { buttonLinkClass } from "@/components/ui/button";
import { RunsTable } from "@/components/runs/runs-table";
import { PageHeader } from "@/components/shell/page-header";
import { requirePageUser } from "@/lib/auth/page";
import { can } from "@/lib/permissions";

export const metadata: Metadata = { title: "Runs" };

export default async function RunsPage() {
  const user = await requirePageUser("run:read", "/runs");
  return (
    <>
      <PageHeader
        title="Runs"
        lede="Each uploaded export, kept byte for byte with its SHA-256, and the channels read from it."
        actions={
          can(user, "run:upload") ? (
            <Link href="/runs/new" className={buttonLinkClass("primary")}>
              Upload exports
            </Link>
          ) : null
        }
      />
      <RunsTable canUpload={can(user, "run:upload")} />
    </>
  );
}
