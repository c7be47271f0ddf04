import type { Metadata } from "next";
import { AreaPlaceholder } from "@/components/shell/area-placeholder";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";

export const metadata: Metadata = { title: "Methods" };

const area = AREAS.find((a) => a.href === "/methods")!;

export default async function Page() {
  await requirePageUser("method:read", "/methods");
  return <AreaPlaceholder title={area.label} purpose={area.purpose} missing="method templates and calibration curves." />;
}
