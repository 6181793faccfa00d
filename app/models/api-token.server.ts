import { randomBytes } from "node:crypto";
import { and, desc, eq, isNull, lt, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { apiTokens, enrollments, studies } from "~/db/schema";
import { studyAccessFor } from "~/server/guards.server";
import { AccountError, type SessionUser } from "~/models/user.server";
import { hashToken } from "~/server/token-hash.server";

const TOKEN_PREFIX = "rbt_";

export type ApiScope = (typeof apiTokens.$inferSelect)["scope"];
export type ApiToken = typeof apiTokens.$inferSelect;

/**
 * Creates a token for the user, limited to one enrollment (`results:write`) or
 * one study (`study:read`) the user may already reach. The token itself is
 * returned once and only its hash is kept.
 */
export async function createApiToken(
  user: SessionUser,
  input: { name: string; scope: ApiScope; enrollmentId?: number | null; studyId?: number | null },
) {
  let enrollmentId: number | null = null;
  let studyId: number | null = null;
  if (input.scope === "results:write") {
    const enrollment = input.enrollmentId ? await db.query.enrollments.findFirst({ where: eq(enrollments.id, input.enrollmentId) }) : undefined;
    if (!enrollment || !user.labIds.includes(enrollment.labId)) throw new AccountError("target", "Choose one of your lab's studies.");
    enrollmentId = enrollment.id;
    studyId = enrollment.studyId;
  } else {
    const found = input.studyId ? await studyAccessFor(user, input.studyId) : null;
    if (!found) throw new AccountError("target", "Choose a study you can see.");
    studyId = found.study.id;
  }
  const token = TOKEN_PREFIX + randomBytes(32).toString("base64url");
  const [row] = await db
    .insert(apiTokens)
    .values({ userId: user.id, name: input.name, scope: input.scope, enrollmentId, studyId, tokenHash: hashToken(token) })
    .returning();
  return { token, row: row! };
}

export async function listApiTokens(userId: number) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      scope: apiTokens.scope,
      studyCode: studies.code,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .leftJoin(studies, eq(studies.id, apiTokens.studyId))
    .where(eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.createdAt));
}

export async function revokeApiToken(userId: number, tokenId: number) {
  await db
    .update(apiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
}

const LAST_USE_RESOLUTION_MS = 60_000;

/** Until when a use of the token needs no new last-use record (epoch ms). */
const lastUseRecordedUntil = (token: ApiToken) => (token.lastUsedAt?.getTime() ?? 0) + LAST_USE_RESOLUTION_MS;

/** The live token behind a bearer string, recording its use (at most once a minute, to spare writes). */
export async function activeApiToken(token: string) {
  if (!token.startsWith(TOKEN_PREFIX)) return null;
  const row = await db.query.apiTokens.findFirst({ where: eq(apiTokens.tokenHash, hashToken(token)) });
  if (!row || row.revokedAt) return null;
  const now = new Date();
  if (now.getTime() > lastUseRecordedUntil(row)) {
    await db
      .update(apiTokens)
      .set({ lastUsedAt: now })
      .where(and(eq(apiTokens.id, row.id), or(isNull(apiTokens.lastUsedAt), lt(apiTokens.lastUsedAt, new Date(now.getTime() - LAST_USE_RESOLUTION_MS)))));
  }
  return row;
}
