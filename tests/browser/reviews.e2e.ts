// Sign-off as the lab does it: the analyst submits a fit (signing), the reviewer finds it in the queue, comments and
// approves with the password, the analyst sees the signature blocks, then changes the fit and the approval is superseded.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
const closers: Array<() => Promise<void>> = [];
let a: Page, r: Page;

beforeAll(async () => {
  for (const [u, set] of [[analyst, (p: Page) => (a = p)], [reviewer, (p: Page) => (r = p)]] as const) {
    const { page, close } = await signedInPage(baseURL, u);
    closers.push(close);
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
    const fitId = fitUrl.split("/").pop()!;

    // The reviewer's home is the review desk: the front door leads to the queue, with its count in the navigation.
    await r.goto(`${baseURL}/`);
    await r.waitForURL(/\/reviews$/);
    const waiting = Number(await r.getByTestId("count-reviews").textContent());
    expect(waiting).toBeGreaterThanOrEqual(1);
    expect(await r.locator("#main tbody tr").count()).toBeGreaterThanOrEqual(waiting);
    await r.getByRole("link", { name: /corvane-blue-30C · Cell 1/ }).waitFor();
    await r.screenshot({ path: path.join(artifacts, "review-desk.png"), fullPage: true });

    // The reviewer's e-mail arrives in the local sink with a link pinned to this version.
    const mailDir = inject("mailDir");
    const findMail = async () => {
      for (const f of fs.existsSync(mailDir) ? fs.readdirSync(mailDir).sort() : []) {
        const m = await simpleParser(fs.readFileSync(path.join(mailDir, f)));
        const to = Array.isArray(m.to) ? m.to.map((x) => x.text).join() : (m.to?.text ?? "");
        // This fit's request (other files may have asked the same reviewer about other records).
        if (to.includes(reviewer.email) && /^Review requested: corvane-blue-30C · Cell 1/.test(m.subject ?? "") && /\/share\//.test(m.text ?? "")) return m.text ?? "";
      }
      return null;
    };
    await expect.poll(findMail, { timeout: 10_000 }).not.toBeNull();
    const link = (await findMail())!.match(/https?:\/\/\S+\/share\/[A-Za-z0-9_-]+/)![0];
    await r.goto(link.replace(/^https?:\/\/[^/]+/, baseURL));
    await r.getByTestId("share-banner").waitFor();
    await r.getByRole("heading", { name: /corvane-blue-30C · Cell 1/ }).waitFor();
    // The reviewer sees the curve they sign: the shared page carries the record's plot.
    await r.getByTestId("record-plot").locator("svg polyline").waitFor({ state: "attached" });
    // At phone width (390 px) the e-mailed page has no horizontal scroll: wide tables scroll in their own box.
    await r.setViewportSize({ width: 390, height: 844 });
    await expect.poll(() => r.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
    await r.screenshot({ path: path.join(artifacts, "share-at-390px.png"), fullPage: true });
    await r.setViewportSize({ width: 1280, height: 800 });
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
    await expect.poll(() => sigs.textContent()).toMatch(/Amara Quist · authored · .*UTC.*Rafe Okonkwo · approved · .*UTC/s);
    await a.screenshot({ path: path.join(artifacts, "fit-approved.png"), fullPage: true });

    // The PDF report carries the signature meaning, the name and the record's hash.
    const pdf = await a.request.get(`${baseURL}/api/fits/${fitId}/report`);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    const pdfFile = path.join(artifacts, "fit-report.pdf");
    fs.writeFileSync(pdfFile, await pdf.body());
    const text = spawnSync("pdftotext", ["-layout", pdfFile, "-"], { encoding: "utf8" }).stdout;
    const hash = (await (await a.request.get(`${baseURL}/api/fits/${fitId}`)).json()).content_hash as string;
    expect(text).toContain("Rafe Okonkwo · APPROVED");
    // The plot is drawn with its axes: tick labels, the time axis and the residual panel.
    expect(text).toMatch(/t \((s|min)\)/);
    expect(text).toMatch(/residual/);
    expect(text).toMatch(/absorbance \(AU\)|concentration/);
    expect(text.replace(/\s+/g, "")).toContain(hash);

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
