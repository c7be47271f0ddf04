import type { Metadata } from "next";
import { LabSettingsForm } from "@/components/admin/lab-settings-form";
import { PageHeader } from "@/components/shell/page-header";
import { getDb } from "@/db";
import { getLabSettings } from "@/lib/admin/settings";
import { requirePageUser } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Lab settings" };

export default async function SettingsPage() {
  const user = await requirePageUser("user:manage", "/admin/settings");
  const s = await getLabSettings(await getDb(), user.labId);
  return (
    <>
      <PageHeader title="Lab settings" lede={`Sharing, uploads and passwords in ${user.labName}.${s.updated_at ? ` Last changed ${s.updated_at.slice(0, 16).replace("T", " ")} UTC.` : " Not changed yet: these are the defaults."}`} />
      <LabSettingsForm initial={s} />
    </>
  );
}
