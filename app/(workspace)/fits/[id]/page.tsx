import type { Metadata } from "next";
import { FitRecordView } from "@/components/fits/fit-record-view";
import { requirePageUser } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Fit record" };

export default async function FitRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("fit:read", `/fits/${id}`);
  return <FitRecordView user={user} id={Number(id)} />;
}
