import type { Metadata } from "next";
import { AreaPlaceholder } from "@/components/shell/area-placeholder";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";

export const metadata: Metadata = { title: "Review queue" };

const area = AREAS.find((a) => a.href === "/reviews")!;

export default async function Page() {
  await requirePageUser("review:read", "/reviews");
  return <AreaPlaceholder title={area.label} purpose={area.purpose} missing="submitting records, comments and signed approvals." />;
}
