// Password forms post to the server and never by GET: they work with scripts off, and no password reaches an address
// (request URLs, history) or the server's log. Common practice (OWASP ASVS 3.x, "sensitive data in the URL").
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import { WRONG_CREDENTIALS } from "@/lib/auth/sign-in";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { openBrowser, signedInPage, signIn } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const mailDir = inject("mailDir");
const serverLog = inject("serverLog");
const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
const admin = DEMO_USERS.find((u) => u.role === "admin")!;
const INVITEE = { email: "orrin.vale@larkspur.example", name: "Orrin Vale", password: "lantern-moss-river-77" };
const secrets = [...DEMO_USERS.map((u) => u.password), INVITEE.password, "wrong-but-secret-9"];

const closers: Array<() => Promise<void>> = [];
const urls: string[] = [];
afterAll(async () => {
  for (const c of closers) await c();
});

async function scriptless(): Promise<Page> {
  const { context, close } = await openBrowser({ javaScriptEnabled: false });
  closers.push(close);
  const page = await context.newPage();
  page.on("request", (r) => urls.push(r.url()));
  return page;
}

describe("with scripts off", () => {
  it("the sign-in form is a POST form, refuses a wrong password with its message, and signs in", async () => {
    const page = await scriptless();
    await page.goto(`${baseURL}/sign-in?next=/fits`);
    const form = page.locator("form").filter({ has: page.getByLabel("Password") });
    expect((await form.getAttribute("method"))?.toLowerCase()).toBe("post");

    await signIn(page, baseURL, analyst.email, "wrong-but-secret-9");
    await expect.poll(() => page.getByTestId("sign-in-error").textContent()).toBe(WRONG_CREDENTIALS);
    // The e-mail is kept, the password is not.
    await expect.poll(() => page.getByLabel("E-mail").inputValue()).toBe(analyst.email);

    await page.goto(`${baseURL}/sign-in?next=/fits`);
    await page.getByLabel("E-mail").fill(analyst.email);
    await page.getByLabel("Password").fill(analyst.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByTestId("workspace-nav").waitFor();
    expect(new URL(page.url()).pathname).toBe("/fits");
    await page.screenshot({ path: path.join(artifacts, "sign-in-no-scripts.png"), fullPage: true });
  });

  it("an invitee sets a password and is signed in", async () => {
    const { page: adminPage, close } = await signedInPage(baseURL, admin);
    closers.push(close);
    const res = await adminPage.request.post(`${baseURL}/api/admin/invitations`, {
      data: { email: INVITEE.email, name: INVITEE.name, role: "analyst" },
      headers: { origin: baseURL },
    });
    expect(res.status()).toBe(201);
    const findLink = async () => {
      for (const f of fs.existsSync(mailDir) ? fs.readdirSync(mailDir).sort() : []) {
        const m = await simpleParser(fs.readFileSync(path.join(mailDir, f)));
        const to = Array.isArray(m.to) ? m.to.map((x) => x.text).join() : (m.to?.text ?? "");
        const link = m.text?.match(/https?:\/\/\S+\/invite\/[A-Za-z0-9_-]+/)?.[0];
        if (to.includes(INVITEE.email) && link) return link.replace(/^https?:\/\/[^/]+/, baseURL);
      }
      return null;
    };
    await expect.poll(findLink, { timeout: 10_000 }).not.toBeNull();
    const page = await scriptless();
    await page.goto((await findLink())!);
    await page.getByLabel("New password").fill(INVITEE.password);
    await page.getByLabel("The same password again").fill(INVITEE.password + "x");
    await page.getByRole("button", { name: "Set password and sign in" }).click();
    await expect.poll(() => page.getByTestId("set-password-error").textContent()).toMatch(/The two passwords differ/);
    await page.getByLabel("New password").fill(INVITEE.password);
    await page.getByLabel("The same password again").fill(INVITEE.password);
    await page.getByRole("button", { name: "Set password and sign in" }).click();
    await page.getByTestId("workspace-nav").waitFor();
    await expect.poll(() => page.getByTestId("signed-in-name").textContent()).toBe(INVITEE.name);
  });
});

describe("with scripts on", () => {
  it("signing in keeps the password out of every address", async () => {
    const { context, close } = await openBrowser();
    closers.push(close);
    const page = await context.newPage();
    page.on("request", (r) => urls.push(r.url()));
    await signIn(page, baseURL, analyst.email, "wrong-but-secret-9");
    await page.getByTestId("sign-in-error").waitFor();
    await signIn(page, baseURL, analyst.email, analyst.password);
    await page.getByTestId("workspace-nav").waitFor();
  });
});

describe("what left the browser and what the server wrote", () => {
  it("no request address and no server log line carries a password", async () => {
    expect(urls.length).toBeGreaterThan(5);
    const decoded = urls.map((u) => decodeURIComponent(u));
    for (const s of secrets) expect(decoded.filter((u) => u.includes(s))).toEqual([]);
    expect(decoded.filter((u) => /[?&]password=/i.test(u))).toEqual([]);
    const log = fs.readFileSync(serverLog, "utf8");
    for (const s of secrets) expect(log.includes(s)).toBe(false);
    // Every form post carried its Origin, so the server actions' own same-origin check had something to compare.
    expect(log).not.toMatch(/Missing `origin` header/);
  });
});
