// Security headers on pages and the API, and the app's own pages (plots included) render with no Content-Security-
// Policy violation in Chromium's console. Header choices: OWASP Secure Headers Project (common practice).
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
let page: Page;
let close: () => Promise<void>;
const violations: string[] = [];

beforeAll(async () => {
  ({ page, close } = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "analyst")!));
  page.on("console", (m) => {
    if (/Content Security Policy|Refused to (load|execute|apply|evaluate|connect|create)/i.test(m.text())) violations.push(m.text());
  });
  page.on("pageerror", (e) => {
    if (/Content Security Policy|unsafe-eval/i.test(e.message)) violations.push(e.message);
  });
});
afterAll(async () => {
  await close();
});

describe("security headers", () => {
  for (const url of ["/sign-in", "/api/me"])
    it(`${url} carries them`, async () => {
      const res = await fetch(`${baseURL}${url}`, { redirect: "manual" });
      const h = res.headers;
      expect(h.get("content-security-policy")).toMatch(/default-src 'self'.*frame-ancestors 'none'/);
      expect(h.get("x-content-type-options")).toBe("nosniff");
      expect(h.get("referrer-policy")).toBe("same-origin");
      expect(h.get("permissions-policy")).toMatch(/camera=\(\)/);
      expect(h.get("x-frame-options")).toBe("DENY");
    });

  it("the main pages, the fitting workspace's plots among them, render with no CSP violation", async () => {
    await page.goto(`${baseURL}/runs`);
    await page.getByRole("link", { name: /corvane-blue-25C-repeat-drift/ }).click();
    await page.getByTestId("fit-link").first().click();
    await page.getByTestId("comparison").waitFor();
    await page.getByRole("figure", { name: "Residuals per model" }).locator(".main-svg").first().waitFor();
    await page.goto(`${baseURL}/fits`);
    await page.getByRole("link", { name: /corvane-blue-25C · Cell 1/ }).first().click();
    await page.getByTestId("versions").waitFor();
    await page.goto(`${baseURL}/studies`);
    await page.getByRole("heading").first().waitFor();
    await page.screenshot({ path: path.join(artifacts, "studies-under-csp.png"), fullPage: true });
    expect(violations).toEqual([]);
  });
});

describe("share pages answer with real status codes", () => {
  it("a revoked link's page is 410 with its message, an unknown link's 404, an open one 200", async () => {
    const fitId = Number((await (await page.request.get(`${baseURL}/api/fits?pageSize=1`)).json()).fits[0].id);
    const headers = { origin: baseURL, "content-type": "application/json" };
    const made = await (await page.request.post(`${baseURL}/api/fits/${fitId}/share`, { headers, data: {} })).json();
    const open = await page.request.get(`${baseURL}${made.path}`);
    expect(open.status()).toBe(200);
    expect((await page.request.post(`${baseURL}/api/share-links/${made.id}/revoke`, { headers, data: {} })).status()).toBe(200);
    const gone = await page.goto(`${baseURL}${made.path}`);
    expect(gone!.status()).toBe(410);
    await expect.poll(() => page.getByTestId("share-message").textContent()).toMatch(/revoked on .* UTC\. Ask the sender for a new one/);
    await page.screenshot({ path: path.join(artifacts, "share-revoked-410.png") });
    const unknown = await page.request.get(`${baseURL}/share/${"x".repeat(32)}`);
    expect(unknown.status()).toBe(404);
  });
});
