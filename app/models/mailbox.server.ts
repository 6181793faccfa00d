/**
 * The local mailbox: while no provider key is set, messages stay in the
 * outbox table and /dev/mailbox shows them. It is a development stand-in:
 * off in production unless MAILBOX=on, and even then a coordinator sees only
 * the mail of the studies they coordinate, and no one sees a live sign-in or
 * invitation link meant for someone else.
 */
import { and, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { emailOutbox, studies, studyCoordinators } from "~/db/schema";
import { isProduction } from "~/server/deployment.server";
import { emailTransport } from "~/server/email.server";
import { notFound, requireRole } from "~/server/guards.server";
import type { SessionUser } from "~/models/user.server";

export function mailboxEnabled(env: NodeJS.ProcessEnv = process.env) {
  if (emailTransport(env) !== "fake") return false;
  return !isProduction(env) || env.MAILBOX === "on";
}

/** The viewer (an admin or a coordinator), or 404 while the mailbox is off. */
export async function requireMailbox(request: Request) {
  if (!mailboxEnabled()) notFound();
  return requireRole(request, "admin", "coordinator");
}

/** What the viewer may read: an admin everything, a coordinator the mail of their own studies. */
async function visibleTo(viewer: SessionUser) {
  const fake = eq(emailOutbox.transport, "fake");
  if (viewer.roles.includes("admin")) return fake;
  const owned = await db.select({ id: studies.id }).from(studies).where(eq(studies.ownerId, viewer.id));
  const shared = await db.select({ id: studyCoordinators.studyId }).from(studyCoordinators).where(eq(studyCoordinators.userId, viewer.id));
  const studyIds = [...owned, ...shared].map((s) => s.id);
  // A coordinator of no study reads nothing: `inArray` of an empty list matches no row.
  return and(fake, inArray(emailOutbox.studyId, studyIds));
}

export async function listMessages(viewer: SessionUser, limit = 200) {
  return db
    .select({ id: emailOutbox.id, to: emailOutbox.to, subject: emailOutbox.subject, createdAt: emailOutbox.createdAt })
    .from(emailOutbox)
    .where(await visibleTo(viewer))
    .orderBy(desc(emailOutbox.id))
    .limit(limit);
}

export async function getMessage(viewer: SessionUser, id: number) {
  const [message] = await db
    .select()
    .from(emailOutbox)
    .where(and(eq(emailOutbox.id, id), await visibleTo(viewer)))
    .limit(1);
  if (!message) return null;
  if (message.to.toLowerCase() === viewer.email.toLowerCase()) return message;
  return { ...message, text: withoutLiveLinks(message.text), html: withoutLiveLinks(message.html) };
}

/** Stands in for a link token in a message addressed to someone else. */
export const HIDDEN_TOKEN = "link-for-the-recipient-only";

/**
 * Invitation and first-password links carry a random token (32 bytes, 43
 * characters in base64url): whoever opens one acts for its recipient. Any
 * such run in a link is replaced, so the link shows where it leads but works
 * for no one.
 */
export function withoutLiveLinks(content: string) {
  return content.replace(/(https?:\/\/[^\s"'<>]*?)[A-Za-z0-9_-]{32,}/g, `$1${HIDDEN_TOKEN}`);
}
