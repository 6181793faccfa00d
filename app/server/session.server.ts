import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { createCookie, createSessionStorage } from "react-router";
import { db } from "~/db/client.server";
import { sessions } from "~/db/schema";

const SESSION_LIFETIME_SECONDS = 60 * 60 * 12;

/** Signing secrets for the app's cookies; the first signs, all verify (rotation). */
export const sessionSecrets = (process.env.SESSION_SECRET ?? "ringbatch-local-session-secret").split(",");

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
    const row = await db.query.sessions.findFirst({ where: eq(sessions.id, id) });
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

/** Ends every session of a user (sign out everywhere, password change, disabled account). */
export async function endAllSessions(userId: number) {
  await db.delete(sessions).where(eq(sessions.userId, userId));
}
