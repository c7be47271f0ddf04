// The administrator validates the installation: runs the reference cases, watches progress, reads every case, signs,
// and downloads the PDF report.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
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
  it("queues a run, shows its progress as it goes, lists every case, signs and downloads the PDF", async () => {
    await page.goto(`${baseURL}/admin/validation`);
    const before = await page.getByTestId("validation-summary").textContent().catch(() => null);
    await page.evaluate(() => {
      const w = window as unknown as { progressSeen: string[] };
      w.progressSeen = [];
      new MutationObserver(() => {
        const t = document.querySelector('[data-testid="validation-progress-text"]')?.textContent;
        if (t && w.progressSeen.at(-1) !== t) w.progressSeen.push(t);
      }).observe(document.body, { subtree: true, childList: true, characterData: true });
    });
    await page.getByTestId("run-validation").click();
    await page.waitForFunction((b) => {
      const s = document.querySelector('[data-testid="validation-summary"]')?.textContent;
      return s && s !== b && !document.querySelector('[data-testid="validation-progress"]');
    }, before, { timeout: 120_000 });
    // The page showed the run's own count as it went (the job's progress, polled), not only a spinner.
    const seen = await page.evaluate(() => (window as unknown as { progressSeen: string[] }).progressSeen);
    expect(seen.some((t) => /^Reference problem \d+ of \d+/.test(t))).toBe(true);
    await expect.poll(() => page.getByTestId("validation-summary").textContent()).toMatch(/\d{3} passed, 0 failed/);
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
