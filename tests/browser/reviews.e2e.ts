// Sign-off as the lab does it: the analyst submits a fit (signing), the reviewer finds it in the queue, comments and
// approves with the password, the analyst sees the signature blocks, then changes the fit and the approval is superseded.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { openBrowser, signIn } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
const closers: Array<() => Promise<void>> = [];
let a: Page, r: Page;

beforeAll(async () => {
  for (const [u, set] of [[analyst, (p: Page) => (a = p)], [reviewer, (p: Page) => (r = p)]] as const) {
    const { context, close } = await openBrowser();
    closers.push(close);
    const page = await context.newPage();
    await signIn(page, baseURL, u.email, u.password);
    await page.getByTestId("workspace-nav").waitFor();
    set(page);
  }
});
afterAll(async () => {
  for (const c of closers) await c();
});

describe("review and sign-off", () => {
  it("submit, comment, approve with signatures, then supersede by a change", async () => {
    await a.goto(`${baseURL}/fits`);
    await a.getByRole("link", { name: /corvane-blue-30C · Cell 1/ }).click();
    const state = (p: Page) => p.getByTestId("review-state");
    await expect.poll(() => state(a).textContent()).toBe("draft");
    await a.getByTestId("submit-review").click();
    await a.getByLabel("Your password").fill(analyst.password);
    await a.getByTestId("sign").click();
    await expect.poll(() => state(a).textContent()).toBe("submitted");
    const fitUrl = a.url();

    await r.goto(`${baseURL}/reviews`);
    await r.getByRole("link", { name: /corvane-blue-30C · Cell 1/ }).click();
    await r.getByLabel("Add a comment").fill("Residuals look random; k agrees with the 25 and 40 °C runs.");
    await r.getByRole("button", { name: "Comment" }).click();
    await r.getByTestId("comments").getByText("Residuals look random").waitFor();
    await r.getByTestId("approve").click();
    await r.getByLabel("Your password").fill("wrong password");
    await r.getByTestId("sign").click();
    await r.getByText("The password is not right: the signature was not made.").waitFor();
    await r.getByLabel("Your password").fill(reviewer.password);
    await r.getByTestId("sign").click();
    await expect.poll(() => state(r).textContent()).toBe("approved");

    await a.goto(fitUrl);
    const sigs = a.getByTestId("signatures");
    await sigs.getByText("Rafe Okonkwo").waitFor();
    await expect(sigs.textContent()).resolves.toMatch(/Amara Quist · authored · .*UTC.*Rafe Okonkwo · approved · .*UTC/s);
    await a.screenshot({ path: path.join(artifacts, "fit-approved.png"), fullPage: true });

    await a.getByRole("link", { name: "Change (new version)" }).click();
    await a.getByTestId("comparison").waitFor();
    await a.getByLabel("Fix A∞ at (measured)").fill("0.05");
    await a.getByLabel("Why this new version (required)").fill("A∞ from the overnight reading");
    await a.getByTestId("save-fit").click();
    await a.waitForURL((u) => u.href !== fitUrl && /\/fits\/\d+$/.test(u.pathname));
    await expect.poll(() => state(a).textContent()).toBe("draft");
    await a.goto(fitUrl);
    await a.getByTestId("superseded").waitFor();
  });
});
