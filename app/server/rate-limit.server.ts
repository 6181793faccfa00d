import { and, count, eq, gt, lt } from "drizzle-orm";
import { db } from "~/db/client.server";
import { rateLimitHits } from "~/db/schema";

export type RateLimit = { bucket: string; max: number; windowMs: number };

export const SIGN_IN_FAILURES: RateLimit = { bucket: "sign-in", max: 5, windowMs: 15 * 60 * 1000 };

/** Failed sign-ins of one account from all addresses together. */
export const ACCOUNT_SIGN_IN_FAILURES: RateLimit = { bucket: "sign-in-account", max: 30, windowMs: 15 * 60 * 1000 };

/** Unknown invitation and first-password links per address: guessing tokens is slowed down. */
export const LINK_MISSES: RateLimit = { bucket: "link", max: 20, windowMs: 15 * 60 * 1000 };

/** Hits kept in the database, so the limit holds across app instances. */
export async function hitCount(limit: RateLimit, key: string) {
  const since = new Date(Date.now() - limit.windowMs);
  const [row] = await db
    .select({ hits: count() })
    .from(rateLimitHits)
    .where(and(eq(rateLimitHits.bucket, limit.bucket), eq(rateLimitHits.key, key), gt(rateLimitHits.createdAt, since)));
  return row?.hits ?? 0;
}

export async function isLimited(limit: RateLimit, key: string) {
  return (await hitCount(limit, key)) >= limit.max;
}

export async function recordHit(limit: RateLimit, key: string) {
  await db.insert(rateLimitHits).values({ bucket: limit.bucket, key });
  // Old hits no longer count; drop them so the table stays small.
  await db
    .delete(rateLimitHits)
    .where(and(eq(rateLimitHits.bucket, limit.bucket), lt(rateLimitHits.createdAt, new Date(Date.now() - limit.windowMs))));
}

export async function clearHits(limit: RateLimit, key: string) {
  await db.delete(rateLimitHits).where(and(eq(rateLimitHits.bucket, limit.bucket), eq(rateLimitHits.key, key)));
}

/**
 * The client's address. The production server (server/app.ts) sets
 * X-Forwarded-For to it, from the connection or, behind a trusted proxy
 * (TRUST_PROXY), from the proxy's report; `local` when there is none.
 */
export function clientAddress(request: Request) {
  return request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() || "local";
}
