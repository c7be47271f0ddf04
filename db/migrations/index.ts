// The migration list, imported statically so the bundled server and the CLI can migrate without a TypeScript loader.
// Add each new file from `npm run db:make-migration` here, in order (a test checks the list matches the folder).
import type { Knex } from "knex";
import * as foundation from "./20261202030000_foundation";
import * as runs from "./20261202040000_runs";
import * as fits from "./20261202050000_fits";
import * as studies from "./20261202060000_studies";
import * as reviews from "./20261202070000_reviews";
import * as sharing from "./20261202080000_sharing";
import * as validation from "./20261202090000_validation";
import * as methods from "./20261202100000_methods";
import * as integrity from "./20261202110000_integrity";
import * as fitsState from "./20261202120000_fits_state";
import * as rateLimits from "./20261202130000_rate_limits";
import * as setupTokens from "./20261202140000_setup_tokens";
import * as rawStoreAndJobs from "./20261202150000_raw_store_and_jobs";

export const MIGRATIONS: ReadonlyArray<{ name: string; up: (k: Knex) => Promise<void>; down: (k: Knex) => Promise<void> }> = [
  { name: "20261202030000_foundation", ...foundation },
  { name: "20261202040000_runs", ...runs },
  { name: "20261202050000_fits", ...fits },
  { name: "20261202060000_studies", ...studies },
  { name: "20261202070000_reviews", ...reviews },
  { name: "20261202080000_sharing", ...sharing },
  { name: "20261202090000_validation", ...validation },
  { name: "20261202100000_methods", ...methods },
  { name: "20261202110000_integrity", ...integrity },
  { name: "20261202120000_fits_state", ...fitsState },
  { name: "20261202130000_rate_limits", ...rateLimits },
  { name: "20261202140000_setup_tokens", ...setupTokens },
  { name: "20261202150000_raw_store_and_jobs", ...rawStoreAndJobs },
];
