// axe-core (npm, the Deque engine) on the main pages of each role: no colour-contrast failure (WCAG 2 AA, 1.4.3) and
// no form field without a label (WCAG 2 A, 1.3.1 / 4.1.2). The rules checked are listed in RULES.
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { openBrowser, signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const AXE = createRequire(import.meta.url).resolve("axe-core/axe.min.js");
const RULES = ["color-contrast", "label", "select-name", "button-name", "link-name", "image-alt", "aria-input-field-name"];
const closers: Array<() => Promise<void>> = [];

async function violations(page: Page, url: string): Promise<string[]> {
  await page.goto(`${baseURL}${url}`);
  await page.waitForLoadState("networkidle");
  await page.addScriptTag({ path: AXE });
  const found = await page.evaluate(async (rules) => {
    const axe = (window as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: Array<{ id: string; nodes: Array<{ target: string[]; failureSummary: string }> }> }> } }).axe;
    const r = await axe.run(document, { runOnly: { type: "rule", values: rules } });
    return r.violations.flatMap((v) => v.nodes.map((n) => `${v.id} at ${n.target.join(" ")}: ${n.failureSummary.split("\n").slice(1, 2).join("")}`));
  }, RULES);
  return found.map((f) => `${url} ${f}`);
}

async function pagesOf(role: string, urls: (page: Page) => Promise<string[]>): Promise<string[]> {
  const { page, close } = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === role)!);
  closers.push(close);
  const out: string[] = [];
  for (const url of await urls(page)) out.push(...(await violations(page, url)));
  return out;
}

async function firstLink(page: Page, list: string, pattern: RegExp): Promise<string> {
  await page.goto(`${baseURL}${list}`);
  const href = await page.locator(`a[href^="${list}/"]`).filter({ hasText: pattern }).first().getAttribute("href");
  return href!;
}

afterAll(async () => {
  for (const c of closers) await c();
});

describe("accessibility of the main pages (axe-core)", () => {
  it("the analyst's pages: runs, a run, the fitting workspace, fits, a fit record, studies, methods", async () => {
    const found = await pagesOf("analyst", async (p) => {
      const run = await firstLink(p, "/runs", /corvane/);
      const fit = await firstLink(p, "/fits", /corvane/);
      await p.goto(`${baseURL}${run}`);
      const workspace = await p.locator('a[href*="/series/"][href$="/fit"]').first().getAttribute("href");
      return ["/runs", run, workspace!, "/runs/new", "/fits", fit, "/studies", "/methods"];
    });
    expect(found).toEqual([]);
  });

  it("the reviewer's and the administrator's pages: the queue, a record, the audit trail, members, validation", async () => {
    const found = [
      ...(await pagesOf("reviewer", async (p) => ["/reviews", await firstLink(p, "/fits", /corvane/)])),
      ...(await pagesOf("admin", async () => ["/admin/audit", "/admin/members", "/admin/validation", "/admin/settings"])),
    ];
    expect(found).toEqual([]);
  });

  it("the sign-in page, and the app's own icon served to anyone", async () => {
    const { context, close } = await openBrowser();
    closers.push(close);
    const page = await context.newPage();
    expect(await violations(page, "/sign-in")).toEqual([]);
    expect(await page.locator('link[rel="icon"]').getAttribute("href")).toMatch(/^\/icon\.svg/);
    const icon = await page.request.get(`${baseURL}/icon.svg`);
    expect(icon.status()).toBe(200);
    expect(icon.headers()["content-type"]).toMatch(/image\/svg\+xml/);
  });
});
