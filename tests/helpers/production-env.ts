// The environment of a production start as a lab runs it (fresh secrets, mail written to the log, a database file of
// its own, nothing inherited but PATH), for tests that start the build themselves.
import { randomBytes } from "node:crypto";
import path from "node:path";

export function productionEnv(home: string, port: number, base: string, extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  return {
    PATH: process.env.PATH!,
    HOME: home,
    PORT: String(port),
    NEXTAUTH_URL: base,
    NEXTAUTH_SECRET: randomBytes(32).toString("base64url"),
    AUDIT_KEY: randomBytes(32).toString("base64url"),
    MAIL_TRANSPORT: "log",
    DATABASE_FILE: path.join(home, "lab.sqlite"),
    ...extra,
  } as unknown as NodeJS.ProcessEnv;
}
