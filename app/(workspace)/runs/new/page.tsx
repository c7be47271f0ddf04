import type { Metadata } from "next";
import { UploadWorkspace } from "@/components/runs/upload-workspace";
import { PageHeader } from "@/components/shell/page-header";
import { requirePageUser } from "@/lib/auth/page";
import { INGEST_LIMITS } from "@/lib/ingest";

export const metadata: Metadata = { title: "Upload exports" };

export default async function UploadPage() {
  await requirePageUser("run:upload", "/runs/new");
  return (
    <>
      <PageHeader
        title="Upload exports"
        lede="Drop one or more spectrophotometer exports. Each is read and shown to you before anything is stored; the original file is kept byte for byte."
      />
      <UploadWorkspace limits={{ maxMB: INGEST_LIMITS.maxBytes / 1048576, maxChannels: INGEST_LIMITS.maxChannels, maxPoints: INGEST_LIMITS.maxPoints }} />
    </>
  );
}
