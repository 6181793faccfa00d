/**
 * First passwords for accounts made by someone else (a lab contact adding a
 * colleague): the new analyst gets an e-mail with a link that works once, for
 * 14 days; only the link token's SHA-256 is stored.
 */
import { randomBytes } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { labs, passwordTokens, users } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { colleagueWelcomeEmail } from "~/server/email-templates.server";
import { createUser, hashPassword, type SessionUser } from "~/models/user.server";
import { hashToken } from "~/server/token-hash.server";

export const WELCOME_LIFETIME_MS = 14 * 24 * 60 * 60 * 1000;


/** Adds a colleague as an analyst of the contact's lab, with no password yet, and e-mails them the link to set one. */
export async function inviteColleague(labId: number, input: { email: string; name: string }, contact: SessionUser, request: Request | null) {
  const lab = (await db.query.labs.findFirst({ where: eq(labs.id, labId) }))!;
  const user = await createUser({ ...input, role: "analyst", labId });
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + WELCOME_LIFETIME_MS);
  await db.insert(passwordTokens).values({ userId: user.id, tokenHash: hashToken(token), expiresAt });
  await recordAudit({ actorUserId: contact.id, action: "colleague_added", entityType: "user", entityId: user.id, after: { labId, email: user.email } });
  await sendEmail(
    colleagueWelcomeEmail({ to: user.email, name: user.name, labName: lab.name, addedBy: contact.name, url: appUrl(request, `/welcome/${token}`), expiresOn: expiresAt.toISOString().slice(0, 10) }),
  );
  return user;
}

export type WelcomeLookup =
  | { status: "unknown" | "used" | "expired" }
  | { status: "valid"; tokenId: number; user: { id: number; name: string; email: string } };

export async function lookupWelcome(token: string, now = new Date()): Promise<WelcomeLookup> {
  const row = await db.query.passwordTokens.findFirst({ where: eq(passwordTokens.tokenHash, hashToken(token)) });
  if (!row) return { status: "unknown" };
  if (row.usedAt) return { status: "used" };
  if (row.expiresAt.getTime() <= now.getTime()) return { status: "expired" };
  const user = await db.query.users.findFirst({ where: eq(users.id, row.userId) });
  if (!user || user.disabledAt) return { status: "unknown" };
  return { status: "valid", tokenId: row.id, user: { id: user.id, name: user.name, email: user.email } };
}

/** Sets the first password; false when the link was used meanwhile (single use even under a race). */
export async function setFirstPassword(found: Extract<WelcomeLookup, { status: "valid" }>, password: string) {
  const passwordHash = await hashPassword(password);
  return db.transaction(async (tx) => {
    const claimed = await tx
      .update(passwordTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordTokens.id, found.tokenId), isNull(passwordTokens.usedAt)))
      .returning({ id: passwordTokens.id });
    if (claimed.length === 0) return false;
    await tx.update(users).set({ passwordHash }).where(eq(users.id, found.user.id));
    await recordAudit({ actorUserId: found.user.id, action: "first_password_set", entityType: "user", entityId: found.user.id }, tx);
    return true;
  });
}
