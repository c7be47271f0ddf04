import type { Metadata } from "next";
import { CalibrationWorkbench } from "@/components/methods/calibration-workbench";
import { MethodsNav } from "@/components/methods/methods-nav";
import { PageHeader } from "@/components/shell/page-header";
import { requirePageUser } from "@/lib/auth/page";

export const metadata: Metadata = { title: "New calibration" };

export default async function NewCalibrationPage() {
  await requirePageUser("calibration:write", "/methods/calibrations/new");
  return (
    <>
      <PageHeader title="New calibration curve" lede="Enter, paste or read the standards; the line, its residuals and the limits update as you go. Saved curves cannot be changed: save a new one instead." />
      <MethodsNav current="calibrations" />
      <CalibrationWorkbench canSave />
    </>
  );
}
