// The fitting workspace as an analyst uses it: open a demo run's fit, see both default fits with residuals, exclude a
// point with a reason, fix A∞, save version 2, see it listed with the exclusion and its reason, and check the CSV's k.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "./env";
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { formatWithUncertainty } from "@/lib/format/number";
import { signedInPage } from "./chromium";

const baseURL = inject("baseURL");
const artifacts = inject("artifacts");
let close: () => Promise<void>;
let page: Page;

beforeAll(async () => {
  ({ page, close } = await signedInPage(baseURL, DEMO_USERS.find((u) => u.role === "analyst")!));
});
afterAll(async () => {
  await close();
});

describe("fitting workspace", () => {
  it("opens a demo run's series and shows both default fits with residuals", async () => {
    await page.goto(`${baseURL}/runs`);
    await page.getByRole("link", { name: /corvane-blue-25C-repeat-drift/ }).click();
    await page.getByTestId("fit-link").first().click();
    const table = page.getByTestId("comparison");
    await table.waitFor();
    // The demo runs follow the demo method, whose models (first-order, then linearized) the page starts from.
    await expect(table.locator("th[data-model]").evaluateAll((rows) => rows.map((r) => r.getAttribute("data-model")))).resolves.toEqual(["first-order", "linearized"]);
    await page.getByRole("figure", { name: "Residuals per model" }).locator(".main-svg").first().waitFor();
    await page.getByText(/linearized and nonlinear first-order k disagree/).waitFor();
    await page.screenshot({ path: path.join(artifacts, "fit-workspace.png"), fullPage: true });
  });

  it("shows every parameter of every model with the unit the model table gives it", async () => {
    await page.goto(`${baseURL}/runs`);
    await page.getByRole("link", { name: /corvane-blue-25C-repeat-drift/ }).click();
    await page.getByTestId("fit-link").first().click();
    await page.getByTestId("comparison").waitFor();
    const url = new URL(page.url());
    url.searchParams.set("models", "first-order,zero-order,second-order,biexponential,linearized");
    await page.goto(url.toString());
    const unitOf = (model: string, param: string) => page.locator(`td[data-model="${model}"][data-param="${param}"] [data-unit]`).first();
    // Common practice (IUPAC Green Book 2.12): order-n rate constants in concentration^(1−n) time⁻¹. The demo run's
    // method converts absorbance by its calibration, in µmol/L.
    const expected: Array<[string, string, string]> = [
      ["first-order", "k", "s⁻¹"],
      ["first-order", "a0", "µmol/L"],
      ["first-order", "ainf", "µmol/L"],
      ["zero-order", "k", "µmol/L s⁻¹"],
      ["second-order", "k", "(µmol/L)⁻¹ s⁻¹"],
      ["biexponential", "k1", "s⁻¹"],
      ["biexponential", "a2", "µmol/L"],
      ["linearized", "k", "s⁻¹"],
    ];
    // The page starts per minute; then per second, as stored.
    for (const [model, param, unit] of expected)
      await expect.poll(async () => (await unitOf(model, param).textContent())?.trim(), { message: `${model} ${param}` }).toBe(unit.replace("s⁻¹", "min⁻¹"));
    await page.screenshot({ path: path.join(artifacts, "fit-workspace-units.png"), fullPage: true });
    await page.getByLabel("Show times in minutes and k per minute (stored in seconds)").uncheck();
    for (const [model, param, unit] of expected) await expect.poll(async () => (await unitOf(model, param).textContent())?.trim(), { message: `${model} ${param}` }).toBe(unit);
    // An own formula: the formula engine is fetched by the fitting worker on first use (not with the page), and the
    // formula's rate constant agrees with the built-in first-order fit of the same data (same model, other start).
    await page.getByLabel("Own formula").check();
    await page.getByLabel("Formula in t (seconds)").fill("a*exp(-k*t) + c");
    await page.getByLabel("Start values (advanced)").fill("k=0.002, a=7, c=1.5");
    const kOf = (model: string) => page.locator(`td[data-model="${model}"][data-param="k"]`).first().textContent();
    await expect.poll(() => kOf("formula"), { timeout: 30_000 }).toMatch(/±/);
    const lead = (t: string | null) => Number((t ?? "").trim().split(/\s/)[0]);
    await expect.poll(async () => Math.abs(lead(await kOf("formula")) / lead(await kOf("first-order")) - 1)).toBeLessThan(1e-3);
  });

  it("the fitting window is typed in the page's time unit, and points outside it are drawn apart from excluded ones", async () => {
    await page.goto(`${baseURL}/runs`);
    await page.getByRole("link", { name: /corvane-blue-40C/ }).first().click();
    await page.getByTestId("fit-link").first().click();
    await page.getByTestId("comparison").waitFor();
    // Minutes are shown by default: the window is entered in minutes and kept in seconds.
    await page.getByLabel("From (min)").fill("1");
    await page.getByLabel("From (min)").blur();
    await page.locator(".legendtext", { hasText: "outside the window" }).first().waitFor();
    await page.getByLabel("Show times in minutes and k per minute (stored in seconds)").uncheck();
    await expect.poll(() => page.getByLabel("From (s)").inputValue()).toBe("60");
    await page.getByLabel("Show times in minutes and k per minute (stored in seconds)").check();
    await expect.poll(() => page.getByLabel("From (min)").inputValue()).toBe("1");
  });

  it("excludes a point with a reason, fixes A∞, survives a dropped connection on save, saves version 2 and shows what changed", async () => {
    await page.goto(`${baseURL}/fits`);
    await page.getByRole("link", { name: /corvane-blue-25C · Cell 1/ }).click();
    await page.getByRole("link", { name: "Change (new version)" }).click();
    await page.getByTestId("comparison").waitFor();
    await page.getByLabel("Exclude point number").fill("5");
    await page.getByRole("button", { name: "Exclude…" }).click();
    await page.getByLabel("Reason (required)").fill("air bubble seen in cell 1");
    await page.getByRole("button", { name: "Exclude", exact: true }).click();
    await expect.poll(() => page.getByTestId("exclusions").textContent()).toMatch(/#5 .*air bubble seen in cell 1/);
    await page.getByLabel("Fix A∞ at (measured)").fill("0.045");
    await page.getByLabel("Why this new version (required)").fill("bubble excluded; A∞ measured after 24 h");
    // A dropped connection: the page says nothing was saved and the Save button works again.
    await page.route("**/api/fits", (route) => (route.request().method() === "POST" ? route.abort("connectionreset") : route.continue()));
    await page.getByTestId("save-fit").click();
    await page.getByText("The server could not be reached, so nothing was saved.").first().waitFor();
    await expect.poll(() => page.getByTestId("save-fit").isEnabled()).toBe(true);
    expect(page.url()).not.toMatch(/\/fits\/\d+$/);
    await page.unroute("**/api/fits");
    await page.getByTestId("save-fit").click();
    await page.waitForURL(/\/fits\/\d+$/);
    const versions = page.getByTestId("versions");
    await versions.waitFor();
    await expect.poll(() => versions.textContent()).toMatch(/Version 2.*Why: bubble excluded; A∞ measured after 24 h.*point 5 excluded: “air bubble seen in cell 1”.*ainf fixed at 0\.045/s);
    await expect.poll(() => page.getByTestId("record-options").textContent()).toMatch(/Point 5 excluded: “air bubble seen in cell 1”/);
    // The plot the reviewer signs: data, the fitted curve and residuals, drawn on the server with axes and units; the
    // excluded point is drawn apart (an open ring).
    const plot = page.getByTestId("record-plot");
    await expect.poll(() => plot.locator("svg[role=img] title").textContent()).toMatch(/version 2: data, fitted curve and residuals/);
    await expect.poll(() => plot.locator("svg").textContent()).toMatch(/absorbance \(AU\).*residual.*t \((s|min)\)/s);
    expect(await plot.locator("svg polyline").count()).toBe(1);
    expect(await plot.locator("svg circle").count()).toBe(1);
    await expect.poll(() => plot.locator("figcaption").textContent()).toMatch(/1 outside the fit.*Nonlinear first order fit/);
    // The record's audit events read as sentences: who did what to which version, and why.
    await expect.poll(() => page.getByTestId("record-audit").textContent()).toMatch(/saved a new version of fit record \d+ version 2, because: bubble excluded/);
    await page.screenshot({ path: path.join(artifacts, "fit-record.png"), fullPage: true });
    // Printed, the record stands alone: the plot and the numbers, without the navigation or the controls.
    await page.emulateMedia({ media: "print" });
    expect(await page.getByTestId("workspace-nav").isVisible()).toBe(false);
    expect(await page.getByTestId("record-plot").isVisible()).toBe(true);
    expect(await page.getByTestId("record-k").isVisible()).toBe(true);
    expect(await page.locator("main button:visible").count()).toBe(0);
    await page.pdf({ path: path.join(artifacts, "fit-record-printed.pdf") });
    await page.emulateMedia({ media: "screen" });

    // The CSV's k, printed the page's way, is the page's k.
    const pageK = (await page.getByTestId("record-k").textContent())!;
    const url = new URL(page.url());
    const id = url.pathname.split("/").pop();
    const csv = await (await page.request.get(`${baseURL}/api/fits/${id}/export?kind=parameters`)).text();
    const row = csv.split("\n").find((l) => l.startsWith("first-order,k,"))!.split(",");
    expect(row[2]).toBe("s⁻¹");
    expect(pageK).toContain(formatWithUncertainty(Number(row[3]), Number(row[4])));
    expect(pageK).toContain("s⁻¹");
    const data = await page.request.get(`${baseURL}/api/fits/${id}/export?kind=data`);
    expect(data.headers()["content-disposition"]).toMatch(/attachment; filename="fit-\d+-v2-data\.csv"/);
    expect(await data.text()).toMatch(/,0,air bubble seen in cell 1,/);

    await page.goto(`${baseURL}/fits`);
    const rowEl = page.getByRole("row", { name: /corvane-blue-25C · Cell 1/ });
    await expect.poll(() => rowEl.getByTestId("fit-version").textContent()).toBe("v2");
  });
});
