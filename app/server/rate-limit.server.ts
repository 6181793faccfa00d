/**
 * Rate limits, counted by rate-limiter-flexible in the `rate_limits` table,
 * so the counters hold across app instances and restarts.
 */
import { lt } from "drizzle-orm";
import { RateLimiterDrizzle, RateLimiterRes } from "rate-limiter-flexible";
import { db } from "~/db/client.server";
import { rateLimits } from "~/db/schema";

export type RateLimit = { bucket: string; max: number; windowMs: number };

/** Failed sign-ins from one address, whatever the accounts: stops one address from trying many accounts. */
export const ADDRESS_SIGN_IN_FAILURES: RateLimit = { bucket: "sign-in-address", max: 100, windowMs: 15 * 60 * 1000 };

/** Unknown invitation and first-password links per address: guessing tokens is slowed down. */
export const LINK_MISSES: RateLimit = { bucket: "link", max: 20, windowMs: 15 * 60 * 1000 };

/**
 * "Forgot your password?" requests: per address, like failed sign-ins, so one
 * address cannot mail many accounts; per account, so no one's mailbox is
 * flooded (past it the page answers the same, and nothing is sent).
 */
export const ADDRESS_RESET_REQUESTS: RateLimit = { bucket: "reset-address", max: 10, windowMs: 15 * 60 * 1000 };
export const ACCOUNT_RESET_REQUESTS: RateLimit = { bucket: "reset-account", max: 3, windowMs: 15 * 60 * 1000 };

/** API requests per caller per minute (`API_RATE_LIMIT_PER_MINUTE` overrides the maximum). */
export const API_REQUESTS: RateLimit = { bucket: "api", max: 600, windowMs: 60_000 };

const limiters = new Map<string, RateLimiterDrizzle>();

function limiterOf({ bucket, max, windowMs }: RateLimit) {
  const name = `${bucket}:${max}:${windowMs}`;
  let limiter = limiters.get(name);
  if (!limiter) {
    limiter = new RateLimiterDrizzle({
      storeClient: db,
      schema: rateLimits,
      keyPrefix: bucket,
      points: max,
      duration: Math.ceil(windowMs / 1000),
      // Expired rows are pruned by `pruneRateLimits`, not by a timer that would keep a process alive.
      clearExpiredByTimeout: false,
    });
    limiters.set(name, limiter);
  }
  return limiter;
}

export async function hitCount(limit: RateLimit, key: string) {
  return (await limiterOf(limit).get(key))?.consumedPoints ?? 0;
}

export async function isLimited(limit: RateLimit, key: string) {
  return (await hitCount(limit, key)) >= limit.max;
}

/** Counts one hit; returns how many the key has in the current window. */
export async function recordHit(limit: RateLimit, key: string) {
  await pruneRateLimits();
  return (await limiterOf(limit).penalty(key, 1)).consumedPoints;
}

/** Drops counters whose window has ended, so the table stays small. */
export async function pruneRateLimits() {
  await db.delete(rateLimits).where(lt(rateLimits.expire, new Date()));
}

export async function clearHits(limit: RateLimit, key: string) {
  await limiterOf(limit).delete(key);
}

/**
 * Counts a request and says whether it is within the limit; when not, how many
 * seconds until the window ends.
 */
export async function consume(limit: RateLimit, key: string): Promise<{ allowed: true } | { allowed: false; retryAfterSeconds: number }> {
  try {
    await limiterOf(limit).consume(key, 1);
    return { allowed: true };
  } catch (refusal) {
    if (refusal instanceof RateLimiterRes) return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(refusal.msBeforeNext / 1000)) };
    throw refusal;
  }
}

/**
 * Growing waits for one account tried from one address: the first few wrong
 * passwords cost nothing, then each one doubles the wait before the next try
 * (2 s, 4 s, 8 s … up to 15 minutes). Someone guessing from elsewhere slows
 * themselves down, never the account's owner at their own address.
 */
const PAIR_FAILURES: RateLimit = { bucket: "sign-in-pair", max: 1_000_000, windowMs: 60 * 60 * 1000 };
const PAIR_WAIT: RateLimit = { bucket: "sign-in-wait", max: 1, windowMs: 15 * 60 * 1000 };
export const FREE_SIGN_IN_FAILURES = 3;
export const LONGEST_SIGN_IN_WAIT_SECONDS = 15 * 60;

export function signInWaitSeconds(failures: number) {
  if (failures < FREE_SIGN_IN_FAILURES) return 0;
  return Math.min(2 ** (failures - FREE_SIGN_IN_FAILURES + 1), LONGEST_SIGN_IN_WAIT_SECONDS);
}

/** Seconds the pair must still wait before its next sign-in attempt (0: may try now). */
export async function signInWaitRemaining(pairKey: string) {
  const waiting = await limiterOf(PAIR_WAIT).get(pairKey);
  return waiting && waiting.consumedPoints > PAIR_WAIT.max ? Math.ceil(waiting.msBeforeNext / 1000) : 0;
}

/** Records a failed sign-in of the pair and starts its wait. */
export async function recordSignInFailure(pairKey: string) {
  const failures = await recordHit(PAIR_FAILURES, pairKey);
  const wait = signInWaitSeconds(failures);
  if (wait > 0) await limiterOf(PAIR_WAIT).block(pairKey, wait);
  return wait;
}

export async function clearSignInFailures(pairKey: string) {
  await clearHits(PAIR_FAILURES, pairKey);
  await clearHits(PAIR_WAIT, pairKey);
}

/**
 * The client's address. The production server (server/app.ts) sets
 * X-Forwarded-For to it, from the connection or, behind a trusted proxy
 * (TRUST_PROXY), from the proxy's report; `local` when there is none.
 */
export function clientAddress(request: Request) {
  return request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() || "local";
}
