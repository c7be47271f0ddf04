import type { Metadata } from "next";
import { ValidationWorkspace } from "@/components/admin/validation-workspace";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { activeJob } from "@/lib/jobs/background";
import { getValidationRecord, validationRuns } from "@/lib/validation/records";

export const metadata: Metadata = { title: "Validation" };

export default async function ValidationPage({ searchParams }: { searchParams: Promise<{ run?: string }> }) {
  const user = await requirePageUser("validation:run", "/admin/validation");
  const db = await getDb();
  const runs = await validationRuns(db, user.labId);
  const { run } = await searchParams;
  const chosen = run ? Number(run) : runs[0]?.id;
  const record = chosen ? await getValidationRecord(db, user.labId, chosen).catch(() => null) : null;
  // A run already under way (started here, in another tab, or by another administrator) is shown with its progress.
  const active = await activeJob(db, user.labId, "validation-run");
  return (
    <>
      <PageHeader
        title="Validation"
        lede="Runs the engine on this installation against the reference problems it ships with (NIST StRD, published examples, generated traces) and keeps a signed report for your computerized-system validation file."
      />
      <ValidationWorkspace runs={runs} record={record} active={active} />
    </>
  );
}
