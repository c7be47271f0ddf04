// Runs once when the server starts: opens the database and applies pending migrations before the first request; on
// PostgreSQL this process also starts listening on the job queue, so any app process behind the database may take a
// queued job.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    const { getDb } = await import("./db");
    const db = await getDb();
    const { isSqliteDb } = await import("./db/config");
    if (!isSqliteDb(db)) {
      const { startQueueWorker } = await import("./lib/jobs/background");
      await startQueueWorker(db);
    }
  }
}
