// The fitting page in Debian's Chromium (headless, no GPU) on the production build, for a 100,000- and a
// 1,000,000-point run: time until the page is usable (its points drawn and its controls working, before the first fit
// lands) and until it shows its first fit (the numbers and the curves drawn), the longest main-thread task meanwhile
// (PerformanceObserver 'longtask': every task over 50 ms), then a changed option (the weighting of the linearized fit)
// until the new fit shows in the table and every plot, with the longest task during it. Targets (issue: big runs): at
// 100k no main-thread task over 100 ms and a changed option shown within 500 ms; at 1M the page usable within 2 s.
import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/demo";
import { openBrowser, signIn } from "../browser/chromium";
import { benchServer } from "./load";

/** The first fit shown: its numbers in the comparison table and the data with the fitted curves drawn. */
async function shown(page: Page): Promise<void> {
  await page.getByTestId("comparison").waitFor({ timeout: 120_000 });
  await page.locator('figure[aria-label="Data and fitted curves"] .scatterlayer .trace').first().waitFor({ timeout: 120_000 });
}

async function longTasks(page: Page): Promise<number[]> {
  return page.evaluate(() => (window as unknown as { __long: number[] }).__long.splice(0));
}

export async function benchPage(): Promise<void> {
  console.log("\nThe fitting page in Chromium (headless, production build): first fit, a changed option, main-thread long tasks");
  const srv = await benchServer([100_000, 1_000_000]);
  if (!srv) {
    console.log("  not measured: no production build here (run npm run build first)");
    return;
  }
  const { context, close } = await openBrowser();
  try {
    await context.addInitScript(() => {
      const w = window as unknown as { __long: number[] };
      w.__long = [];
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__long.push(e.duration);
      }).observe({ type: "longtask", buffered: true });
    });
    const page = await context.newPage();
    const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
    await signIn(page, srv.base, analyst.email, analyst.password);
    await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"));
    // The first visits fetch the bundles and compile plotly (about 3.5 MB of script); Chromium keeps the compiled code
    // after the second, as for a returning user. Those visits are reported on their own, then each size is measured warm.
    for (const visit of ["first visit (cold)", "second visit"]) {
      await page.goto("about:blank");
      await longTasks(page).catch(() => []);
      const t0 = Date.now();
      await page.goto(`${srv.base}/runs/${srv.series[0]!.runId}/series/${srv.series[0]!.seriesId}/fit`);
      await shown(page);
      const tasks = await longTasks(page);
      console.log(`  ${visit}, 100,000 points: first fit shown ${Date.now() - t0} ms, longest main-thread task ${tasks.length ? Math.max(...tasks).toFixed(0) : "none over 50"} ms`);
    }

    for (const s of srv.series) {
      const url = `${srv.base}/runs/${s.runId}/series/${s.seriesId}/fit`;
      await page.goto("about:blank");
      const t0 = Date.now();
      await page.goto(url);
      // Usable: the points drawn and the controls working, which the page is before its first fit lands.
      const usable = page.locator('figure[aria-label="Data and fitted curves"] .scatterlayer .trace').first().waitFor({ timeout: 120_000 }).then(() => Date.now() - t0);
      await shown(page);
      const firstFit = Date.now() - t0;
      const usableMs = await usable;
      const loadTasks = await longTasks(page);

      const table = page.getByTestId("comparison");
      const before = await table.innerText();
      const t1 = Date.now();
      await page.getByLabel("Weight the linearized fit by (y − A∞)²").check();
      await page.waitForFunction(
        (prev) => {
          const sec = document.querySelector('[aria-label="Model comparison"]');
          const tab = document.querySelector('[data-testid="comparison"]') as HTMLElement | null;
          // The new numbers in the table and every plot drawn with them (no figure waiting for its turn).
          return sec?.getAttribute("aria-busy") === "false" && tab !== null && tab.innerText !== prev && document.querySelector('figure[aria-busy="true"]') === null;
        },
        before,
        { timeout: 120_000, polling: 10 },
      );
      const changed = Date.now() - t1;
      const changeTasks = await longTasks(page);
      const max = (xs: number[]) => (xs.length ? Math.max(...xs).toFixed(0) : "none over 50");
      console.log(`  ${s.n.toLocaleString("en").padStart(9)} points: usable (points drawn, controls working) ${usableMs} ms, first fit shown ${firstFit} ms (longest main-thread task ${max(loadTasks)} ms, ${loadTasks.filter((d) => d > 100).length} over 100 ms); changed option shown ${changed} ms (longest task ${max(changeTasks)} ms)`);
      const verdict = (ok: boolean) => (ok ? "met" : "NOT met");
      const longest = Math.max(0, ...loadTasks, ...changeTasks);
      if (s.n === 100_000)
        console.log(`      targets at 100k: no main-thread task over 100 ms: ${verdict(longest <= 100)} (${longest.toFixed(0)} ms); a changed option within 500 ms: ${verdict(changed <= 500)}`);
      if (s.n === 1_000_000) console.log(`      target at 1M: usable within 2 s: ${verdict(usableMs <= 2000)}`);
    }
    console.log("  (a task over 100 ms on loading is plotly's own: evaluating its ~3.5 MB module, the first plot's set-up; DEVELOPERS.md)");
  } finally {
    await close();
    await srv.stop();
  }
}
