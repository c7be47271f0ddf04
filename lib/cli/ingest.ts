// `cli ingest`: not built yet (the ingest issue adds lib/ingest and the storage of runs).
import { CliError } from "./main";

export async function ingestCommand(_argv: string[]): Promise<never> {
  throw new CliError("the verb \"ingest\" is not built yet: storing runs arrives with the ingest work (lib/ingest).", 2);
}
