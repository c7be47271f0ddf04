// Debian's Chromium driven by playwright-core (never a browser download), with the flags this closed network needs.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

export async function openBrowser(opts: { javaScriptEnabled?: boolean } = {}): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-chromium-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1280, height: 800 },
    javaScriptEnabled: opts.javaScriptEnabled ?? true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
    ],
  });
  return {
    context,
    close: async () => {
      await context.close();
      fs.rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

export async function signIn(page: Page, baseURL: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseURL}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** A fresh browser with a page signed in as the user (the set-up every browser test starts from). */
export async function signedInPage(baseURL: string, user: { email: string; password: string }): Promise<{ page: Page; close: () => Promise<void> }> {
  const { context, close } = await openBrowser();
  const page = await context.newPage();
  await signIn(page, baseURL, user.email, user.password);
  await page.getByTestId("workspace-nav").waitFor();
  return { page, close };
}
