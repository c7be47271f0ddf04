// Runs once when the server starts: opens the database and applies pending migrations before the first request.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    const { getDb } = await import("./db");
    await getDb();
  }
}
