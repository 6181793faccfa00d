/**
 * Links that set a password: a first one for an account made by someone else
 * (a lab contact adding a colleague, an administrator), or a new one when it
 * was forgotten. A link works once — for 14 days when it welcomes, for 30
 * minutes when it resets — and only the token's SHA-256 is stored.
 */
import { randomBytes } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { labs, type PasswordLinkPurpose, passwordTokens, users } from "~/db/schema";
import { formatDate, formatDateTime } from "~/lib/format";
import { recordAudit } from "~/server/audit.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { accountWelcomeEmail, colleagueWelcomeEmail, passwordResetEmail } from "~/server/email-templates.server";
import { createUser, findUserByEmail, hashPassword, type NewUser, type SessionUser } from "~/models/user.server";
import { endAllSessions } from "~/server/session.server";
import { hashToken } from "~/server/token-hash.server";

export const LINK_LIFETIME_MS: Record<PasswordLinkPurpose, number> = { welcome: 14 * 24 * 60 * 60 * 1000, reset: 30 * 60 * 1000 };

export function passwordLinkPath(purpose: PasswordLinkPurpose, token: string) {
  return purpose === "welcome" ? `/welcome/${token}` : `/reset-password/${token}`;
}

/** A fresh link for the account; a reset link retires the account's earlier unused reset links. */
async function issueLink(userId: number, purpose: PasswordLinkPurpose, request: Request | null) {
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + LINK_LIFETIME_MS[purpose]);
  await db.transaction(async (tx) => {
    if (purpose === "reset") {
      await tx
        .update(passwordTokens)
        .set({ expiresAt: new Date() })
        .where(and(eq(passwordTokens.userId, userId), eq(passwordTokens.purpose, "reset"), isNull(passwordTokens.usedAt)));
    }
    await tx.insert(passwordTokens).values({ userId, tokenHash: hashToken(token), purpose, expiresAt });
  });
  return { url: appUrl(request, passwordLinkPath(purpose, token)), expiresAt };
}

/** Adds a colleague as an analyst of the contact's lab, with no password yet, and e-mails them the link to set one. */
export async function inviteColleague(labId: number, input: { email: string; name: string }, contact: SessionUser, request: Request | null) {
  const lab = (await db.query.labs.findFirst({ where: eq(labs.id, labId) }))!;
  const user = await createUser({ ...input, roles: ["analyst"], labId });
  const link = await issueLink(user.id, "welcome", request);
  await recordAudit({ actorUserId: contact.id, action: "colleague_added", entityType: "user", entityId: user.id, after: { labId, email: user.email } });
  await sendEmail(colleagueWelcomeEmail({ to: user.email, name: user.name, labName: lab.name, addedBy: contact.name, url: link.url, expiresOn: formatDate(link.expiresAt) }));
  return user;
}

/** An administrator's new account: no password travels by hand, the person sets their own from an e-mailed link. */
export async function createAccountWithWelcome(input: NewUser, admin: SessionUser, request: Request | null) {
  const user = await createUser(input);
  const link = await issueLink(user.id, "welcome", request);
  await recordAudit({ actorUserId: admin.id, action: "user_created", entityType: "user", entityId: user.id, after: { email: user.email, roles: input.roles } });
  await sendEmail(accountWelcomeEmail({ to: user.email, name: user.name, roles: input.roles, addedBy: admin.name, url: link.url, expiresOn: formatDate(link.expiresAt) }));
  return user;
}

/**
 * "Forgot your password?": an active account gets a reset link by e-mail;
 * an unknown or disabled address gets nothing, and the caller answers the
 * same either way, so the form tells no one which addresses have accounts.
 */
export async function requestPasswordReset(email: string, request: Request | null) {
  const user = await findUserByEmail(email);
  if (!user || user.disabledAt) return;
  const link = await issueLink(user.id, "reset", request);
  await recordAudit({ actorUserId: null, action: "password_reset_requested", entityType: "user", entityId: user.id });
  await sendEmail(passwordResetEmail({ to: user.email, name: user.name, url: link.url, expiresAt: formatDateTime(link.expiresAt) }));
}

export type PasswordLinkLookup =
  | { status: "unknown" | "used" | "expired" }
  | { status: "valid"; tokenId: number; user: { id: number; name: string; email: string; role: SessionUser["role"] } };

/** What a link opens; a link of the other purpose is unknown here. */
export async function lookupPasswordLink(token: string, purpose: PasswordLinkPurpose, now = new Date()): Promise<PasswordLinkLookup> {
  const row = await db.query.passwordTokens.findFirst({ where: and(eq(passwordTokens.tokenHash, hashToken(token)), eq(passwordTokens.purpose, purpose)) });
  if (!row) return { status: "unknown" };
  if (row.usedAt) return { status: "used" };
  if (row.expiresAt.getTime() <= now.getTime()) return { status: "expired" };
  const user = await db.query.users.findFirst({ where: eq(users.id, row.userId) });
  if (!user || user.disabledAt) return { status: "unknown" };
  return { status: "valid", tokenId: row.id, user: { id: user.id, name: user.name, email: user.email, role: user.role } };
}

/**
 * Sets the password; false when the link was used meanwhile (single use even
 * under a race). A reset also ends every session the account had.
 */
export async function setPasswordFromLink(found: Extract<PasswordLinkLookup, { status: "valid" }>, purpose: PasswordLinkPurpose, password: string) {
  const passwordHash = await hashPassword(password);
  const done = await db.transaction(async (tx) => {
    const claimed = await tx
      .update(passwordTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordTokens.id, found.tokenId), isNull(passwordTokens.usedAt)))
      .returning({ id: passwordTokens.id });
    if (claimed.length === 0) return false;
    await tx.update(users).set({ passwordHash }).where(eq(users.id, found.user.id));
    await recordAudit({ actorUserId: found.user.id, action: purpose === "welcome" ? "first_password_set" : "password_reset", entityType: "user", entityId: found.user.id }, tx);
    return true;
  });
  if (done && purpose === "reset") await endAllSessions(found.user.id);
  return done;
}
