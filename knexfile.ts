// Knex CLI configuration (npm run db:make-migration). The app itself migrates in code: see db/migrate.ts.
import { DEFAULT_DATABASE_FILE, sqliteConfig } from "./db/config";

const config = {
  ...sqliteConfig(process.env.DATABASE_FILE ?? DEFAULT_DATABASE_FILE),
  migrations: { directory: "./db/migrations", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
