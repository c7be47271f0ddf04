import type { Metadata } from "next";
import { AreaPlaceholder } from "@/components/shell/area-placeholder";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";

export const metadata: Metadata = { title: "Fits" };

const area = AREAS.find((a) => a.href === "/fits")!;

export default async function Page() {
  await requirePageUser("fit:read", "/fits");
  return <AreaPlaceholder title={area.label} purpose={area.purpose} missing="the fitting workspace and saved fit records." />;
}
