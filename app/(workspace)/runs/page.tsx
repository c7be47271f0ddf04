import type { Metadata } from "next";
import { AreaPlaceholder } from "@/components/shell/area-placeholder";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";

export const metadata: Metadata = { title: "Runs" };

const area = AREAS.find((a) => a.href === "/runs")!;

export default async function Page() {
  await requirePageUser("run:read", "/runs");
  return <AreaPlaceholder title={area.label} purpose={area.purpose} missing="uploading exports and the runs list." />;
}
