import { randomBytes } from "node:crypto";
import { and, eq, isNull, sql } from "drizzle-orm";
import { createCookie, createSessionStorage } from "react-router";
import { db, preparedOnce } from "~/db/client.server";
import { apiTokens, sessions } from "~/db/schema";
import { assertDeploymentConfig } from "~/server/deployment.server";

const SESSION_LIFETIME_SECONDS = 60 * 60 * 12;

/**
 * Signing secrets for the app's cookies; the first signs, all verify
 * (rotation). The built-in one is for development only: production refuses
 * to run without SESSION_SECRET.
 */
function configuredSecrets(env: NodeJS.ProcessEnv = process.env) {
  if (env.SESSION_SECRET) return env.SESSION_SECRET.split(",");
  // In production this throws, naming every missing setting.
  assertDeploymentConfig(env);
  return ["ringbatch-local-session-secret"];
}
export const sessionSecrets = configuredSecrets();

const sessionCookie = createCookie("__ringbatch_session", {
  httpOnly: true,
  sameSite: "lax",
  path: "/",
  secure: process.env.NODE_ENV === "production",
  maxAge: SESSION_LIFETIME_SECONDS,
  // The cookie only carries a random id; signing makes a forged id fail before any lookup.
  secrets: sessionSecrets,
});

function expiryFrom(expires: Date | undefined) {
  return expires ?? new Date(Date.now() + SESSION_LIFETIME_SECONDS * 1000);
}

// Read on every signed-in request.
const sessionById = preparedOnce((database) => database.query.sessions.findFirst({ where: eq(sessions.id, sql.placeholder("id")) }).prepare());

/** Sessions live in the database, so any number of app instances can serve a user. */
export const sessionStorage = createSessionStorage<{ userId: number }>({
  cookie: sessionCookie,
  async createData(data, expires) {
    const id = randomBytes(32).toString("base64url");
    await db.insert(sessions).values({
      id,
      userId: data.userId ?? null,
      data: data as Record<string, unknown>,
      expiresAt: expiryFrom(expires),
    });
    return id;
  },
  async readData(id) {
    const row = await sessionById().execute({ id });
    if (!row) return null;
    if (row.expiresAt.getTime() < Date.now()) {
      await db.delete(sessions).where(eq(sessions.id, id));
      return null;
    }
    return row.data as { userId: number };
  },
  async updateData(id, data, expires) {
    await db
      .update(sessions)
      .set({ data: data as Record<string, unknown>, userId: data.userId ?? null, expiresAt: expiryFrom(expires) })
      .where(eq(sessions.id, id));
  },
  async deleteData(id) {
    await db.delete(sessions).where(eq(sessions.id, id));
  },
});

/**
 * Ends every session of a user and revokes their API tokens (sign out
 * everywhere, password change, disabled account): whoever held either loses it.
 */
export async function endAllSessions(userId: number) {
  await db.transaction(async (tx) => {
    await tx.delete(sessions).where(eq(sessions.userId, userId));
    await tx.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
  });
}
