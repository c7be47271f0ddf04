import { attachment } from "@/lib/http/download";
import { withUser } from "@/lib/http/with-user";
import { rawFileDownload } from "@/lib/runs";
import { idParam } from "@/lib/schemas/common";

// The original bytes, exactly as uploaded, with their SHA-256.
export const GET = withUser<{ id: string }>({ permission: "run:read" }, async ({ params, db, user }) => {
  const f = await rawFileDownload(db, user.labId, idParam.parse(params.id));
  return new Response(new Uint8Array(f.bytes), {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": attachment(f.name),
      "x-content-sha256": f.sha256,
      "content-length": String(f.size),
    },
  });
});
