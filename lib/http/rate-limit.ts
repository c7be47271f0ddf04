// Rate limits by client address and by account, counted in the database (rate-limiter-flexible's SQLite and
// PostgreSQL stores over the app's Knex), so several server processes on one database share them. A refusal is a 429
// with Retry-After; a flood is audited once per window (its first refused request), not per request.
import type { Knex } from "knex";
import { RateLimiterPostgres, RateLimiterRes, RateLimiterSQLite, type RateLimiterStoreAbstract } from "rate-limiter-flexible";
import { recordAudit } from "@/lib/audit";
import { AppError } from "@/lib/errors";
import { isSqliteDb } from "@/db/config";

interface Rule {
  points: number;
  /** Seconds. */
  duration: number;
  what: string;
}

/** Limits per window; numbers chosen as common practice (OWASP Authentication Cheat Sheet: throttle, do not only lock). */
export const RATE_RULES = {
  /** Sign-in attempts from one address, over every account. */
  signInByAddress: { points: 30, duration: 15 * 60, what: "sign-in attempts from this address" },
  /** Sign-in attempts for one e-mail, from every address (the lockout counts failures in a row; this counts all). */
  signInByAccount: { points: 20, duration: 15 * 60, what: "sign-in attempts for this e-mail" },
  /** Share-link opens from one address (each open is a token guess when the token is wrong). */
  shareByAddress: { points: 60, duration: 60, what: "share-link opens from this address" },
  /** Refused instrument API keys from one address. */
  apiKeyFailuresByAddress: { points: 10, duration: 15 * 60, what: "refused API keys from this address" },
  /** Requests with one instrument key (a busy instrument, or a stolen key). */
  apiKeyRequests: { points: Number(process.env.API_KEY_RATE_LIMIT ?? 30), duration: 60, what: "requests with this API key" },
  /** Invitation-token opens and password settings from one address. */
  invitationByAddress: { points: 20, duration: 15 * 60, what: "invitation links opened from this address" },
} satisfies Record<string, Rule>;
export type RateRule = keyof typeof RATE_RULES;

/**
 * A site may change a limit's count (not its window) with RATE_LIMITS, e.g. "signInByAddress=200" for a lab whose
 * users all reach the server from one NAT address: "name=count" pairs separated by commas. Unknown names stop start.
 */
export function applyRateOverrides(spec: string | undefined): void {
  for (const pair of (spec ?? "").split(",").map((p) => p.trim()).filter(Boolean)) {
    const [name, value] = pair.split("=").map((x) => x.trim());
    const n = Number(value);
    if (!name || !(name in RATE_RULES) || !Number.isInteger(n) || n < 1)
      throw new Error(`RATE_LIMITS: "${pair}" is not a known limit with a whole count (limits: ${Object.keys(RATE_RULES).join(", ")}).`);
    (RATE_RULES[name as RateRule] as Rule).points = n;
  }
}
applyRateOverrides(process.env.RATE_LIMITS);

const limiters = new WeakMap<Knex, Map<RateRule, RateLimiterStoreAbstract>>();

function limiterFor(db: Knex, rule: RateRule): RateLimiterStoreAbstract {
  let byRule = limiters.get(db);
  if (!byRule) limiters.set(db, (byRule = new Map()));
  let l = byRule.get(rule);
  if (!l) {
    const r = RATE_RULES[rule];
    const opts = { storeClient: db, storeType: "knex", tableName: "rate_limits", tableCreated: true, clearExpiredByTimeout: false, keyPrefix: rule, points: r.points, duration: r.duration };
    l = isSqliteDb(db) ? new RateLimiterSQLite(opts) : new RateLimiterPostgres(opts);
    byRule.set(rule, l);
  }
  return l;
}

function refusal(rule: RateRule, res: RateLimiterRes): AppError {
  const wait = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
  const r = RATE_RULES[rule];
  const minutes = r.duration >= 120 ? `${r.duration / 60} minutes` : `${r.duration} seconds`;
  return new AppError({ code: "too_many_requests", message: `Too many ${r.what}: at most ${r.points} in ${minutes}. Try again in ${wait < 120 ? `${wait} s` : `${Math.ceil(wait / 60)} min`}.`, retryAfter: wait });
}

async function auditFlood(db: Knex, rule: RateRule, key: string, labId: number | null): Promise<void> {
  await recordAudit(db, { labId, actorUserId: null, actorLabel: key.slice(0, 254), action: "security.rate_limited", reason: `${RATE_RULES[rule].what} over ${RATE_RULES[rule].points} in ${RATE_RULES[rule].duration} s` });
}

/** Counts one request; throws 429 (audited once per window) when the key is over its limit. */
export async function takeOrRefuse(db: Knex, rule: RateRule, key: string, labId: number | null = null): Promise<void> {
  try {
    await limiterFor(db, rule).consume(key);
  } catch (e) {
    if (!(e instanceof RateLimiterRes)) throw e;
    if (e.consumedPoints === RATE_RULES[rule].points + 1) await auditFlood(db, rule, key, labId);
    throw refusal(rule, e);
  }
}

/** For limits on failures only: refuses (without counting) a key already over its limit. */
export async function refuseIfOver(db: Knex, rule: RateRule, key: string): Promise<void> {
  const res = await limiterFor(db, rule).get(key);
  if (res && res.consumedPoints > RATE_RULES[rule].points) throw refusal(rule, res);
}

/** For limits on failures only: counts one failure (the caller then answers the failure itself, or 429 past the limit). */
export async function countFailure(db: Knex, rule: RateRule, key: string, labId: number | null = null): Promise<void> {
  await takeOrRefuse(db, rule, key, labId);
}

/**
 * The client's address: the last X-Forwarded-For entry, which is what the nearest hop saw (Next.js fills the header
 * from the socket when a request arrives without one; a reverse proxy in front must append, or overwrite, it). A
 * client talking to Next.js directly can write its own header, so per-address limits are backed by per-account and
 * per-key ones.
 */
export function clientAddress(headers: Headers): string {
  const xff = headers.get("x-forwarded-for");
  const last = xff?.split(",").pop()?.trim();
  return last || headers.get("x-real-ip") || "unknown";
}
