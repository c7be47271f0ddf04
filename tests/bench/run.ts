// `npm run bench`: benchmarks with figures and ratios against named peers run side by side (never timed tests).
// `npm run bench -- engine`, `-- formula`, `-- ingest`, `-- audit`, `-- limits`, `-- global`, `-- series`, `-- cli`, `-- load` or `-- page` runs one part (load and page need `npm run build` first).
import { benchAudit } from "./audit";
import { benchCli } from "./cli";
import { benchEngine } from "./engine";
import { benchFormula } from "./formula";
import { benchGlobal } from "./global";
import { benchIngest } from "./ingest";
import { benchLimits } from "./limits";
import { benchLoad } from "./load";
import { benchPage } from "./page";
import { benchSeries } from "./series";

const only = process.argv[2];
console.log(`Halflight benchmarks on Node ${process.version}, ${process.platform}/${process.arch}`);
if (!only || only === "engine") benchEngine();
if (!only || only === "formula") benchFormula();
if (!only || only === "ingest") benchIngest();
if (!only || only === "global") benchGlobal();
if (!only || only === "cli") benchCli();
(async () => {
  if (!only || only === "audit") await benchAudit();
  if (!only || only === "limits") await benchLimits();
  if (!only || only === "series") await benchSeries();
  if (!only || only === "load") await benchLoad();
  if (!only || only === "page") await benchPage();
})().catch((e: unknown) => {
  console.error(e);
  process.exitCode = 1;
});
