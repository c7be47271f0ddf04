// `npm run demo` step one: migrate DATABASE_FILE and seed the demo scenario when the database is empty.
import { openConfiguredDb } from "../index";
import { migrateToLatest } from "../migrate";
import { DEMO_USERS, seedDemoWhenEmpty } from "../seeds/demo";
import { authSecret } from "../../lib/auth/secret";

async function main() {
  const { db, where } = openConfiguredDb();
  try {
    await migrateToLatest(db);
    console.log(`Database ready: ${where}`);
    if (process.argv.includes("--no-seed")) return;
    if (await seedDemoWhenEmpty(db, new Date(), { runs: true })) {
      console.log("Demo lab seeded. Demo accounts (demo passwords, never for real data):");
      for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(17)} ${u.email.padEnd(32)} ${u.password}`);
    }
    authSecret();
  } finally {
    await db.destroy();
  }
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
