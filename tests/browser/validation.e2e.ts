// The administrator validates the installation: runs the reference cases, watches progress, reads every case, signs,
// and downloads the PDF report.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const admin = DEMO_USERS.find((u) => u.role === "admin")!;
let close: () => Promise<void>;
let page: Page;

beforeAll(async () => {
  ({ page, close } = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "admin")!));
});
afterAll(async () => {
  await close();
});

describe("validation", () => {
  it("runs every case with progress, lists them, signs and downloads the PDF", async () => {
    await page.goto(`${baseURL}/admin/validation`);
    await page.evaluate(() => {
      (window as unknown as { sawProgress: boolean }).sawProgress = false;
      new MutationObserver(() => {
        if (document.querySelector('[data-testid="validation-progress"]')) (window as unknown as { sawProgress: boolean }).sawProgress = true;
      }).observe(document.body, { subtree: true, childList: true });
    });
    await page.getByTestId("run-validation").click();
    await page.getByTestId("validation-summary").waitFor({ timeout: 60_000 });
    expect(await page.evaluate(() => (window as unknown as { sawProgress: boolean }).sawProgress)).toBe(true);
    await expect(page.getByTestId("validation-summary").textContent()).resolves.toMatch(/\d{3} passed, 0 failed/);
    expect(await page.getByTestId("validation-cases").locator("tr").count()).toBeGreaterThan(250);
    await page.getByLabel("Your password, to sign").fill(admin.password);
    await page.getByRole("button", { name: "Sign the report" }).click();
    await page.getByText(/Signed by Ines Marsh \(reviewed\)/).waitFor();
    await page.screenshot({ path: path.join(artifacts, "validation.png") });

    const href = await page.getByTestId("validation-pdf").getAttribute("href");
    const pdf = await page.request.get(`${baseURL}${href}`);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    const file = path.join(artifacts, "validation-report.pdf");
    fs.writeFileSync(file, await pdf.body());
    const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout;
    expect(text).toMatch(/ALL CASES PASSED/);
    expect(text).toMatch(/Ines Marsh · REVIEWED/);
    expect(text).toMatch(/PASS\s+Misra1a b1/);
  });
});
