// A new install, started as a lab would start it (npm start's script, production variables, an empty database): the
// console prints a one-time set-up address; the first-run page refuses without that token and creates the lab and its
// administrator with it, who then sees an empty lab.
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../helpers/free-port";
import { productionEnv } from "../helpers/production-env";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { openBrowser } from "./chromium";

const artifacts = inject("artifacts");
let server: ChildProcess;
let out = "";
let base = "";
let page: Page;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-first-run-"));


beforeAll(async () => {
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  server = spawn(process.execPath, ["dist/serve.mjs"], {
    env: productionEnv(dir, port, base),
  });
  server.stdout!.on("data", (b: Buffer) => (out += b.toString()));
  server.stderr!.on("data", (b: Buffer) => (out += b.toString()));
  const until = Date.now() + 60_000;
  while (!/Ready in/.test(out) && Date.now() < until) await new Promise((r) => setTimeout(r, 200));
});
afterAll(async () => {
  server?.kill("SIGTERM");
  fs.rmSync(dir, { recursive: true, force: true });
});

async function submitLab(p: Page) {
  await p.getByLabel("Lab name").fill("Harbour Assay Lab");
  await p.getByLabel("Short name for addresses (lower case, digits, dashes)").fill("harbour");
  await p.getByLabel("Your name").fill("T. Wren");
  await p.getByLabel("Your e-mail").fill("lead@harbour.example");
  await p.getByLabel("Password", { exact: true }).fill("a long private passphrase");
  await p.getByLabel("The same password again").fill("a long private passphrase");
  await p.getByRole("button", { name: "Create the lab and sign in" }).click();
}

describe("first run of a new install", () => {
  it("prints a one-time address; the page refuses a wrong token and creates the lab with the right one", async () => {
    const printed = out.match(/\/first-run\?token=([A-Za-z0-9_-]+)/);
    expect(printed, out).not.toBeNull();
    const b = await openBrowser();
    page = await b.context.newPage();
    try {
      await page.goto(`${base}/first-run`);
      await page.getByLabel("Set-up token (printed on the server's console)").fill("not-the-token-printed");
      await submitLab(page);
      await expect.poll(() => page.getByTestId("first-run-error").textContent()).toMatch(/set-up token is not right/);
      await page.screenshot({ path: path.join(artifacts, "first-run-refused.png"), fullPage: true });

      await page.goto(`${base}/first-run?token=${printed![1]}`);
      await submitLab(page);
      await page.waitForURL(/\/admin\/members$/);
      // An empty lab, no demo data: its administrator is its only member.
      await expect.poll(() => page.locator("#main").textContent()).toMatch(/lead@harbour\.example/);
      await expect.poll(() => page.locator("#main tbody tr").count()).toBe(1);
      await page.screenshot({ path: path.join(artifacts, "first-run-empty-lab.png"), fullPage: true });
      // Once a lab exists the page is gone.
      expect((await page.request.get(`${base}/first-run`)).status()).toBe(404);
    } finally {
      await b.close();
    }
  });
});
