import type { Metadata } from "next";
import { AreaPlaceholder } from "@/components/shell/area-placeholder";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";

export const metadata: Metadata = { title: "Temperature studies" };

const area = AREAS.find((a) => a.href === "/studies")!;

export default async function Page() {
  await requirePageUser("study:read", "/studies");
  return <AreaPlaceholder title={area.label} purpose={area.purpose} missing="grouping fits by temperature and the Arrhenius and Eyring analyses." />;
}
