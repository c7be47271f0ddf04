// A temperature study as a stability chemist builds one: from the demo fits, see Ea with its CI and both plots, predict
// t90 at 25 °C with the caution, correct one member's temperature with a reason and get a new version; then submit it
// for review (signed), and a reviewer finds it in the queue, approves it with a signature and exports its PDF.
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
const developer = DEMO_USERS.find((u) => u.role === "method_developer")!;
const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
let close: () => Promise<void>;
let page: Page;

beforeAll(async () => {
  ({ page, close } = await signedInPage(baseURL, developer));
});
afterAll(async () => {
  await close();
});

describe("temperature study", () => {
  it("builds a study from the demo fits, predicts t90 at 25 °C, and versions a corrected temperature", async () => {
    await page.goto(`${baseURL}/studies`);
    await page.getByLabel("Study name").fill("Four temperatures, built in the browser");
    for (const c of ["25C ·", "30C ·", "40C ·", "50C ·"]) await page.getByRole("checkbox", { name: new RegExp(`corvane-blue-${c}`) }).check();
    await page.getByTestId("create-study").click();
    await page.waitForURL(/\/studies\/\d+$/);
    const ea = page.getByTestId("study-ea");
    await ea.waitFor();
    await expect.poll(() => ea.textContent()).toMatch(/Ea = \d+(\.\d+)? ± \d+(\.\d+)? kJ mol⁻¹/);
    await page.getByText(/95 % CI .* kJ mol⁻¹/).waitFor();
    await page.getByRole("figure", { name: /Arrhenius plot/ }).locator(".main-svg").first().waitFor();
    await page.getByRole("figure", { name: /Eyring plot/ }).locator(".main-svg").first().waitFor();

    await page.getByLabel("Target temperature (°C)").fill("25");
    await expect.poll(() => page.getByTestId("prediction").textContent()).toMatch(/t90 = .*\(95 % PI/);
    await expect.poll(() => page.getByTestId("caution").textContent()).toMatch(/qualified review.*local regulations/);
    await page.getByLabel("Target temperature (°C)").fill("5");
    await expect.poll(() => page.getByTestId("extrapolation").textContent()).toMatch(/outside the measured 25\.0–50\.0 °C/);
    await page.screenshot({ path: path.join(artifacts, "study.png"), fullPage: true });

    await page.getByLabel("Temperature of corvane-blue-30C").fill("30.6");
    await page.getByLabel("Why corvane-blue-30C is at this temperature").fill("block probe calibrated: 30.6 °C");
    await page.getByLabel("Why this new version (required)").fill("temperature correction from the calibration certificate");
    await page.getByTestId("save-study").click();
    await page.getByText("Version 2 of 2").waitFor();
    await expect.poll(() => page.getByTestId("study-versions").textContent()).toMatch(/Version 2.*temperature correction from the calibration certificate/s);
    await page.getByText("block probe calibrated: 30.6 °C").waitFor();
  });

  it("the author submits the newest version (signed); the reviewer approves it from the queue with a signature and exports the PDF", async () => {
    // The page left by the first test: version 2 of the study, by this method developer.
    await page.getByTestId("submit-review").click();
    await page.getByLabel("Your password").fill(developer.password);
    await page.getByTestId("sign").click();
    await expect.poll(() => page.getByTestId("review-state").textContent()).toBe("submitted");
    const studyUrl = page.url();

    const { page: r, close: closeReviewer } = await signedInPage(baseURL, reviewer);
    try {
      await r.goto(`${baseURL}/reviews`);
      const row = r.getByRole("row", { name: /study\s*Four temperatures, built in the browser/ });
      await row.waitFor();
      await row.getByRole("link", { name: "Four temperatures, built in the browser" }).click();
      await r.waitForURL(studyUrl);
      await r.getByTestId("approve").click();
      await r.getByLabel("Your password").fill(reviewer.password);
      await r.getByTestId("sign").click();
      // Either the state moves or the page says why not (shown in the failure).
      await r.waitForFunction(() => document.querySelector('[data-testid="review-state"]')?.textContent === "approved" || document.querySelector('[data-testid="toast"][role="alert"]'), null, { timeout: 30_000 });
      expect(await r.locator('[data-testid="toast"][role="alert"]').allTextContents()).toEqual([]);
      await expect.poll(() => r.getByTestId("review-state").textContent()).toBe("approved");
      await expect.poll(() => r.getByTestId("signatures").textContent()).toMatch(/Teodor Vale · authored.*Rafe Okonkwo · approved/is);
      await r.screenshot({ path: path.join(artifacts, "study-approved.png"), fullPage: true });

      const href = await r.getByTestId("study-pdf").getAttribute("href");
      const pdf = await r.request.get(`${baseURL}${href}`);
      expect(pdf.status()).toBe(200);
      expect(pdf.headers()["content-type"]).toBe("application/pdf");
      const file = path.join(artifacts, "study-report.pdf");
      fs.writeFileSync(file, await pdf.body());
      const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
      expect(text.status, "pdftotext (Debian's poppler-utils) is needed").toBe(0);
      expect(text.stdout).toMatch(/Arrhenius plot/);
      expect(text.stdout).toMatch(/1000 \/ T \(K⁻¹\)/);
      expect(text.stdout).toMatch(/Rafe Okonkwo · APPROVED/);
      expect(text.stdout).toMatch(/block probe\s+calibrated:\s+30\.6\s+°C/);

      // A share link to the approved version opens read-only with its plots, and fits a phone's width.
      const studyId = new URL(studyUrl).pathname.split("/").pop();
      const made = await r.request.post(`${baseURL}/api/studies/${studyId}/share`, { data: {} });
      expect(made.status()).toBe(201);
      const { path: linkPath } = (await made.json()) as { path: string };
      await r.setViewportSize({ width: 390, height: 844 });
      await r.goto(`${baseURL}${linkPath}`);
      await r.getByTestId("share-banner").waitFor();
      await expect.poll(() => r.getByTestId("shared-study-results").textContent()).toMatch(/Ea = [\d.]+ ± [\d.]+ kJ mol⁻¹/);
      await expect(r.getByTestId("shared-arrhenius").locator("svg text").allTextContents()).resolves.toContain("1000 / T (K⁻¹)");
      await expect.poll(() => r.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
      await r.screenshot({ path: path.join(artifacts, "study-share-at-390px.png"), fullPage: true });
    } finally {
      await closeReviewer();
    }
  });
});
