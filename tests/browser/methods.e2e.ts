// Methods, calibration and administration as the lab uses them: the method developer enters six standards and writes
// a method with acceptance criteria on that calibration; the analyst gives a run that method and sees each criterion
// pass or fail on its fit; the administrator invites a colleague, the mail arrives in the local sink, and the invitee
// sets a password and signs in with the role given.
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { openBrowser, signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
const mailDir = inject("mailDir");
const who = (role: string) => DEMO_USERS.find((u) => u.role === role)!;
const closers: Array<() => Promise<void>> = [];
const pages: Record<string, Page> = {};

beforeAll(async () => {
  for (const role of ["method_developer", "analyst", "admin"]) {
    const { page, close } = await signedInPage(baseURL, who(role));
    closers.push(close);
    pages[role] = page;
  }
});
afterAll(async () => {
  for (const c of closers) await c();
});

// Six standards of an invented scenario (Larkspur's in-house blue, µmol/L), pasted as spreadsheet cells (tabs).
const STANDARDS = ["Conc\tAbs\tRep", "0\t0.0021\t1", "1\t0.0634\t1", "2\t0.1262\t1", "4\t0.2493\t1", "6\t0.3747\t1", "8\t0.4990\t1"].join("\n");

describe("methods and calibration", () => {
  it("a method developer saves a calibration from six pasted standards and a method with criteria on it", async () => {
    const p = pages.method_developer!;
    await p.goto(`${baseURL}/methods/calibrations/new`);
    await p.getByLabel("Name", { exact: true }).fill("Larkspur blue standards, bench 2");
    await p.getByLabel("Analyte").fill("larkspur blue");
    await p.getByLabel("Concentration unit").fill("µmol/L");
    await p.getByLabel(/Cells from a spreadsheet/).fill(STANDARDS);
    await p.getByRole("button", { name: "Use pasted rows" }).click();
    await expect.poll(() => p.getByTestId("standards").locator("tbody tr").count()).toBe(6);
    // Slope by OLS of the six standards (the same engine the server runs; its numbers are checked in unit tests).
    await expect.poll(() => p.getByTestId("cal-slope").textContent()).toMatch(/^0\.062/);
    await p.getByTestId("cal-lod").waitFor();
    await p.screenshot({ path: path.join(artifacts, "calibration-new.png"), fullPage: true });
    await p.getByTestId("save-calibration").click();
    await p.waitForURL(/\/methods\/calibrations\/\d+$/);
    await p.getByRole("heading", { name: "Larkspur blue standards, bench 2" }).waitFor();
    await expect.poll(() => p.getByTestId("cal-slope").textContent()).toMatch(/^0\.062/);

    await p.goto(`${baseURL}/methods/new`);
    await p.getByLabel("Method name").fill("Larkspur blue fade, bench 2");
    await p.getByLabel("Analyte").fill("larkspur blue");
    await p.getByLabel("Wavelength (nm)").fill("590");
    await p.getByLabel("Concentration from").selectOption("calibration");
    await p.getByLabel("Calibration curve").selectOption({ label: "Larkspur blue standards, bench 2 (larkspur blue)" });
    await p.getByLabel("Use: r² at least").check();
    await p.getByLabel("r² at least", { exact: true }).fill("0.9999");
    await p.getByLabel("Use: points fitted at least").check();
    await p.getByLabel("points fitted at least", { exact: true }).fill("20");
    await p.getByLabel("Use: SE(k)/k at most (%)").check();
    await p.getByLabel("SE(k)/k at most (%)", { exact: true }).fill("2");
    // Checked with the route's own schema before anything is sent: the field says what is wrong.
    await p.getByLabel("Window from (s)").fill("600");
    await p.getByLabel("Window to (s)").fill("60");
    await p.getByTestId("save-method").click();
    await p.getByText("The window must end after it starts.").first().waitFor();
    expect(p.url()).toMatch(/\/methods\/new$/);
    await p.screenshot({ path: path.join(artifacts, "method-form-refused.png"), fullPage: true });
    await p.getByLabel("Window from (s)").fill("");
    await p.getByLabel("Window to (s)").fill("");
    await p.getByTestId("save-method").click();
    await p.waitForURL(/\/methods\/\d+$/);
    const criteria = () => p.getByTestId("method-criteria").textContent();
    await expect.poll(criteria).toContain("r² ≥ 0.9999");
    await expect.poll(criteria).toContain("at least 20 points fitted");
    await expect.poll(criteria).toContain("SE(k)/k ≤ 2 %");
    await p.screenshot({ path: path.join(artifacts, "method.png"), fullPage: true });
  });

  it("the analyst gives a run that method; its fit shows pass or fail per criterion, also on the saved record", async () => {
    const p = pages.analyst!;
    await p.goto(`${baseURL}/runs`);
    await p.getByRole("link", { name: "corvane-blue-25C-repeat-drift" }).click();
    await p.getByTestId("run-method").getByRole("button", { name: "Change" }).click();
    await p.getByLabel("Method", { exact: true }).selectOption({ label: "Larkspur blue fade, bench 2 (v1)" });
    await p.getByLabel("Reason (required)").fill("bench 2 method applies to this repeat");
    await p.getByRole("button", { name: "Save" }).click();
    await p.getByTestId("run-method").getByRole("link", { name: "Larkspur blue fade, bench 2" }).waitFor();
    await p.getByTestId("fit-link").first().click();
    const panel = p.getByTestId("criteria-panel");
    await panel.waitFor();
    await expect.poll(() => panel.textContent()).toContain("Larkspur blue fade, bench 2");
    const verdicts = async () => Object.fromEntries(await panel.locator("li[data-criterion]").evaluateAll((els) => els.map((e) => [e.getAttribute("data-criterion"), e.getAttribute("data-pass")])));
    await expect.poll(verdicts).toEqual({ r2_min: "false", min_points: "true", rel_se_k_max: "true" });
    // The fit was converted by the method's calibration: concentrations, not absorbance.
    await expect.poll(() => p.getByLabel(/Convert by calibration/).isChecked()).toBe(true);
    await p.screenshot({ path: path.join(artifacts, "fit-with-method.png"), fullPage: true });
    await p.getByTestId("save-fit").click();
    await p.waitForURL(/\/fits\/\d+$/);
    const rec = p.getByTestId("record-criteria");
    await rec.waitFor();
    await expect.poll(() => rec.textContent()).toMatch(/1 not met/);
    await expect.poll(() => rec.locator("tr[data-criterion='r2_min']").textContent()).toMatch(/fail/);
    await expect.poll(() => rec.locator("tr[data-criterion='min_points']").textContent()).toMatch(/pass/);
    await p.goto(`${baseURL}/fits`);
    await expect.poll(() => p.getByTestId("fit-criteria").first().textContent()).toMatch(/not met|all met/);
  });
});

describe("administration", () => {
  it("an admin invites a colleague; the mail arrives in the sink; the invitee sets a password and signs in as reviewer", async () => {
    const p = pages.admin!;
    await p.goto(`${baseURL}/admin/members`);
    await p.getByLabel("E-mail", { exact: true }).fill("pia.ostrander@larkspur.example");
    await p.getByLabel("Name", { exact: true }).fill("Pia Ostrander");
    await p.getByLabel("Role", { exact: true }).selectOption("reviewer");
    await p.getByTestId("send-invitation").click();
    await p.getByTestId("invitation-pia.ostrander@larkspur.example").getByText("open").waitFor();

    const findMail = async () => {
      for (const f of fs.existsSync(mailDir) ? fs.readdirSync(mailDir).sort() : []) {
        const m = await simpleParser(fs.readFileSync(path.join(mailDir, f)));
        const to = Array.isArray(m.to) ? m.to.map((x) => x.text).join() : (m.to?.text ?? "");
        if (to.includes("pia.ostrander@larkspur.example") && /invited/.test(m.subject ?? "")) return m.text ?? "";
      }
      return null;
    };
    await expect.poll(findMail, { timeout: 10_000 }).not.toBeNull();
    const link = (await findMail())!.match(/https?:\/\/\S+\/invite\/[A-Za-z0-9_-]+/)![0];

    const { context, close } = await openBrowser();
    closers.push(close);
    const q = await context.newPage();
    await q.goto(link.replace(/^https?:\/\/[^/]+/, baseURL));
    await q.getByRole("heading", { name: "Welcome, Pia Ostrander" }).waitFor();
    await q.getByLabel("New password").fill("short");
    await q.getByLabel("The same password again").fill("short");
    await q.getByRole("button", { name: "Set password and sign in" }).click();
    await expect.poll(() => q.getByTestId("set-password-error").textContent()).toMatch(/at least 12 characters/);
    await q.getByLabel("New password").fill("heron-quartz-tide-2026");
    await q.getByLabel("The same password again").fill("heron-quartz-tide-2026");
    await q.getByRole("button", { name: "Set password and sign in" }).click();
    await q.getByTestId("workspace-nav").waitFor();
    const me = await q.evaluate(async () => (await fetch("/api/me")).json());
    expect(me).toMatchObject({ user: { email: "pia.ostrander@larkspur.example" }, role: "reviewer" });
    await q.getByTestId("workspace-nav").getByRole("link", { name: "Review queue" }).waitFor();
    await q.screenshot({ path: path.join(artifacts, "invitee-signed-in.png"), fullPage: true });
    // The link works once.
    await q.goto(link.replace(/^https?:\/\/[^/]+/, baseURL));
    await expect.poll(() => q.getByTestId("invite-message").textContent()).toMatch(/used already/);
    await p.reload();
    await p.getByTestId("invitation-pia.ostrander@larkspur.example").getByText("accepted").waitFor();
    await p.screenshot({ path: path.join(artifacts, "members.png"), fullPage: true });
    // Sorting is done by the server and kept in the address: names from Z to A.
    await p.getByRole("button", { name: /^Name/ }).click();
    await expect.poll(() => p.url()).toMatch(/sort=name&dir=desc/);
    await expect.poll(() => p.locator("tbody tr").first().getAttribute("data-testid")).toBe("member-teodor.vale@larkspur.example");
  });

  it("with outside reviewers allowed in Lab settings, a mailed link opens read-only without an account", async () => {
    const p = pages.admin!;
    await p.goto(`${baseURL}/admin/settings`);
    await p.getByLabel(/Share links may be sent to outside reviewers/).check();
    await p.getByLabel("Why this change (required)").fill("partner QA reviews the corvane study");
    // A form on the route's schema: a password rule the route refuses is shown on its field before anything is sent,
    // and a dropped connection is said in words with the Save button usable again.
    await p.getByLabel("Passwords at least (characters)").fill("8");
    await p.getByRole("button", { name: "Save settings" }).click();
    await p.getByText("Passwords shorter than 10 characters are not allowed here.").first().waitFor();
    await p.getByLabel("Passwords at least (characters)").fill("12");
    await p.route("**/api/admin/settings", (route) => (route.request().method() === "PUT" ? route.abort("connectionreset") : route.continue()));
    await p.getByRole("button", { name: "Save settings" }).click();
    await p.getByText("The server could not be reached, so nothing was saved.").first().waitFor();
    await expect.poll(() => p.getByRole("button", { name: "Save settings" }).isEnabled()).toBe(true);
    await p.unroute("**/api/admin/settings");
    await p.getByRole("button", { name: "Save settings" }).click();
    await p.getByText("Settings saved").waitFor();
    const a = pages.analyst!;
    await a.goto(`${baseURL}/fits`);
    const shared = await a.evaluate(async () => {
      const r = await fetch("/api/fits/1/share", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ recipient: "qa.partner@fennwick.example" }) });
      return { status: r.status, body: await r.json() };
    });
    expect(shared.status).toBe(201);
    const { context, close } = await openBrowser();
    closers.push(close);
    const q = await context.newPage();
    await q.goto(`${baseURL}${shared.body.path}`);
    await q.getByTestId("share-banner").getByText(/Larkspur Stability Services shared this with you read-only/).waitFor();
    await q.getByTestId("record-k").waitFor();
    expect(await q.getByTestId("report-pdf").count()).toBe(0);
    expect(await q.getByLabel("Audit events of this record").count()).toBe(0);
    await q.screenshot({ path: path.join(artifacts, "share-outside.png"), fullPage: true });
  });
});
