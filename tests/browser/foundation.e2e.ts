// The foundation as a person meets it: sign-in, each role's navigation, lockout, redirects and 403s.
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { inject } from "./env";
import { WRONG_CREDENTIALS } from "@/lib/auth/sign-in";
import type { BrowserContext, Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { AREAS } from "@/lib/navigation";
import { can } from "@/lib/permissions";
import { openBrowser, signIn } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
let context: BrowserContext;
let close: () => Promise<void>;
let page: Page;

beforeEach(async () => {
  ({ context, close } = await openBrowser());
  page = await context.newPage();
});
afterEach(async () => {
  await close();
});

describe("each demo role", () => {
  for (const u of DEMO_USERS) {
    it(`${u.role} signs in and sees exactly its navigation`, async () => {
      await signIn(page, baseURL, u.email, u.password);
      const nav = page.getByTestId("workspace-nav");
      await nav.waitFor();
      // A link's text may end with a count of waiting records (the review desk's badge, checked in reviews.e2e.ts).
      const labels = (await nav.getByRole("link").allTextContents()).map((s) => s.trim().replace(/\d+$/, ""));
      const expected = AREAS.filter((a) => can({ userId: 0, role: u.role }, a.permission)).map((a) => a.label);
      expect(labels).toEqual(expected);
      expect(labels.length).toBeGreaterThan(0);
      await expect.poll(() => page.getByTestId("signed-in-name").textContent()).toBe(u.name);
      await page.screenshot({ path: path.join(artifacts, `home-${u.role}.png`), fullPage: true });

      // Areas outside the role answer 403 with a page that says so; those inside, 200. Every status is the real one,
      // though list pages stream a skeleton first (their guard runs in a layout above the skeleton's boundary).
      for (const a of AREAS) {
        const r = await page.request.get(`${baseURL}${a.href}`, { maxRedirects: 0 });
        expect(r.status(), `${u.role} ${a.href}`).toBe(can({ userId: 0, role: u.role }, a.permission) ? 200 : 403);
      }
      const hidden = AREAS.find((a) => !can({ userId: 0, role: u.role }, a.permission));
      if (hidden) {
        const res = await page.goto(`${baseURL}${hidden.href}`);
        expect(res?.status()).toBe(403);
        // The 403 page may stream in after the status line: wait for it rather than look once.
        await page.getByRole("heading", { name: "Not open to your role" }).waitFor();
      }
    });
  }
});

describe("sign-in refusals", () => {
  it("a wrong password shows a clear message", async () => {
    const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
    await signIn(page, baseURL, analyst.email, "not-the-password");
    const alert = page.getByTestId("sign-in-error");
    await alert.waitFor();
    await expect.poll(() => alert.textContent()).toBe(WRONG_CREDENTIALS);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await page.screenshot({ path: path.join(artifacts, "sign-in-wrong-password.png") });
  });

  it("after five failures even the right password is refused", async () => {
    const probe = inject("lockoutUser");
    for (let i = 1; i <= 5; i++) {
      await signIn(page, baseURL, probe.email, `wrong-${i}`);
      await page.getByTestId("sign-in-error").waitFor();
      // wait for this attempt's answer before the next one
      await page.getByRole("button", { name: "Sign in" }).waitFor();
    }
    // The same words as any refused sign-in: an outsider cannot tell a locked account from an unknown e-mail.
    await expect.poll(() => page.getByTestId("sign-in-error").textContent()).toMatch(/sign-in is paused after 5 failed attempts in a row/);
    await signIn(page, baseURL, probe.email, probe.password);
    const alert = page.getByTestId("sign-in-error");
    await alert.waitFor();
    await expect.poll(() => alert.textContent()).toMatch(/The e-mail or password is not right, or sign-in is paused/);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await page.screenshot({ path: path.join(artifacts, "sign-in-locked.png") });
  });
});

describe("signed out", () => {
  it("a page visit redirects to sign-in and keeps where it was going", async () => {
    await page.goto(`${baseURL}/fits`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(new URL(page.url()).searchParams.get("next")).toBe("/fits");
    await page.screenshot({ path: path.join(artifacts, "sign-in.png") });
  });

  it("the API answers 401 in the error envelope", async () => {
    const res = await page.request.get(`${baseURL}/api/me`);
    expect(res.status()).toBe(401);
    expect((await res.json()).error.code).toBe("unauthorized");
  });
});

describe("an analyst", () => {
  it("gets 403 from an admin API, and its own identity from /api/me", async () => {
    const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
    await signIn(page, baseURL, analyst.email, analyst.password);
    await page.getByTestId("workspace-nav").waitFor();
    const denied = await page.request.get(`${baseURL}/api/admin/members`);
    expect(denied.status()).toBe(403);
    expect((await denied.json()).error).toMatchObject({ code: "forbidden" });
    const me = await page.request.get(`${baseURL}/api/me`);
    expect(me.status()).toBe(200);
    expect(await me.json()).toMatchObject({ role: "analyst", user: { email: analyst.email }, lab: { slug: "larkspur" } });
  });

  it("signs out and is sent back to sign-in", async () => {
    const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
    await signIn(page, baseURL, analyst.email, analyst.password);
    await page.getByTestId("workspace-nav").waitFor();
    // The session cookie as it was before signing out: a copy kept elsewhere must stop working too.
    const cookie = (await context.cookies(baseURL)).map((c) => `${c.name}=${c.value}`).join("; ");
    expect((await fetch(`${baseURL}/api/me`, { headers: { cookie } })).status).toBe(200);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((u) => u.pathname === "/sign-in");
    await page.goto(`${baseURL}/runs`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await expect.poll(async () => (await fetch(`${baseURL}/api/me`, { headers: { cookie } })).status).toBe(401);
  });
});
