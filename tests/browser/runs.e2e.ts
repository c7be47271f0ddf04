// Uploading as an analyst would: drag two exports onto the page, watch progress and preview, map, save, find both runs,
// open one and see its plot, and be offered the existing run when the same file comes again.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const FIX = path.resolve("parsers/delimited/fixtures");
const FILES = ["cv-semicolon-decimal-comma.csv", "cv-tab-mmss.txt"];
let close: () => Promise<void>;
let page: Page;

beforeAll(async () => {
  ({ page, close } = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "analyst")!));
});
afterAll(async () => {
  await close();
});

async function dropFiles(names: string[]) {
  const files = names.map((n) => ({ name: n, b64: fs.readFileSync(path.join(FIX, n)).toString("base64") }));
  const dataTransfer = await page.evaluateHandle((list) => {
    const dt = new DataTransfer();
    for (const f of list) {
      const bin = Uint8Array.from(atob(f.b64), (c) => c.charCodeAt(0));
      dt.items.add(new File([bin], f.name, { type: "text/plain" }));
    }
    return dt;
  }, files);
  const zone = page.getByTestId("dropzone");
  await zone.dispatchEvent("dragenter", { dataTransfer });
  await zone.dispatchEvent("drop", { dataTransfer });
}

describe("upload, preview, map, save", () => {
  it("drags two files, shows progress and previews, saves both with a mapping", async () => {
    await page.goto(`${baseURL}/runs/new`);
    await page.getByText("Limits: 50 MB per file").waitFor();
    // Record every progress bar the page shows, however briefly.
    await page.evaluate(() => {
      (window as unknown as { seen: number[] }).seen = [];
      new MutationObserver(() => {
        document.querySelectorAll('[role="progressbar"]').forEach((p) => (window as unknown as { seen: number[] }).seen.push(Number(p.getAttribute("aria-valuenow"))));
      }).observe(document.body, { subtree: true, childList: true, attributes: true });
    });
    await dropFiles(FILES);
    const cards = page.getByTestId("upload-card");
    await expect.poll(() => cards.count()).toBe(2);
    for (const name of FILES) await page.getByRole("article", { name: `File ${name}` }).getByText("Read, not stored yet").waitFor();
    const seen = await page.evaluate(() => (window as unknown as { seen: number[] }).seen);
    expect(seen.length).toBeGreaterThan(0);

    const semi = page.getByRole("article", { name: `File ${FILES[0]}` });
    await semi.getByText("Time (s);Abs").waitFor();
    await expect.poll(() => semi.getByLabel("Wavelength (nm)").inputValue()).toBe("590");
    await expect.poll(() => semi.getByLabel("Temperature (°C)").inputValue()).toBe("24.6");
    await semi.getByLabel("Run name").fill("Crystal violet, semicolon export");
    await semi.getByLabel("Study").fill("Parser shapes");
    await semi.locator(".js-plotly-plot").first().waitFor();
    await page.screenshot({ path: path.join(artifacts, "upload-preview.png"), fullPage: true });

    for (const name of FILES) {
      const card = page.getByRole("article", { name: `File ${name}` });
      await card.getByTestId("save-run").click();
      await card.getByTestId("saved-note").waitFor();
      await expect.poll(() => card.getByTestId("saved-note").textContent()).toMatch(/Stored as run \d+/);
    }
  });

  it("lists both runs, opens one and shows its plot", async () => {
    await page.goto(`${baseURL}/runs`);
    await page.getByRole("link", { name: /Crystal violet, semicolon export/ }).waitFor();
    await page.getByRole("link", { name: /cv-tab-mmss/ }).waitFor();
    await page.screenshot({ path: path.join(artifacts, "runs-list.png"), fullPage: true });
    await page.getByRole("link", { name: /Crystal violet, semicolon export/ }).click();
    await page.getByRole("heading", { name: "Crystal violet, semicolon export" }).waitFor();
    await page.locator(".js-plotly-plot .main-svg").first().waitFor();
    await page.getByText("24.6 °C").waitFor();
    await page.getByText(/SHA-256 [0-9a-f]{64}/).waitFor();
    await page.screenshot({ path: path.join(artifacts, "run-page.png"), fullPage: true });
  });

  it("offers the existing run when the same file is uploaded again", async () => {
    await page.goto(`${baseURL}/runs/new`);
    await page.getByText("Limits: 50 MB per file").waitFor();
    await dropFiles([FILES[1]!]);
    const note = page.getByTestId("duplicate-note");
    await note.waitFor();
    await expect.poll(() => note.textContent()).toMatch(/already stored as/);
  });

  it("a refused file names the problem and the line", async () => {
    await dropFiles(["bad-half-number.csv"]);
    const err = page.getByRole("article", { name: "File bad-half-number.csv" }).getByTestId("upload-error");
    await err.waitFor();
    await expect.poll(() => err.textContent()).toMatch(/bad-half-number\.csv: line 4: "A" holds "0\.5x26", which is not a number/);
  });
});
