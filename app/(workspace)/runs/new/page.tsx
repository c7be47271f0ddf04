import type { Metadata } from "next";
import { UploadWorkspace } from "@/components/runs/upload-workspace";
import { PageHeader } from "@/components/shell/page-header";
import { requirePageUser } from "@/lib/auth/page";
import { getDb } from "@/db";
import { INGEST_LIMITS, uploadLimitBytes } from "@/lib/ingest";
import { methodChoices } from "@/lib/methods";

export const metadata: Metadata = { title: "Upload exports" };

export default async function UploadPage() {
  const user = await requirePageUser("run:upload", "/runs/new");
  const db = await getDb();
  const maxBytes = await uploadLimitBytes(db, user.labId);
  return (
    <>
      <PageHeader
        title="Upload exports"
        lede="Drop one or more spectrophotometer exports. Each is read and shown to you before anything is stored; the original file is kept byte for byte."
      />
      <UploadWorkspace methods={await methodChoices(db, user.labId)} limits={{ maxMB: maxBytes / 1048576, maxChannels: INGEST_LIMITS.maxChannels, maxPoints: INGEST_LIMITS.maxPoints }} />
    </>
  );
}
