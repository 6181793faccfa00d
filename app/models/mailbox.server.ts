/**
 * The local mailbox: while no provider key is set, messages stay in the
 * outbox table and /dev/mailbox shows them.
 */
import { desc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { emailOutbox } from "~/db/schema";
import { emailTransport } from "~/server/email.server";
import { notFound, requireRole } from "~/server/guards.server";

export function mailboxEnabled() {
  return emailTransport() === "fake";
}

/** Messages carry sign-in links, so only admins and coordinators see them, and only while no real provider is set. */
export async function requireMailbox(request: Request) {
  await requireRole(request, "admin", "coordinator");
  if (!mailboxEnabled()) notFound();
}

export async function listMessages(limit = 200) {
  return db
    .select({ id: emailOutbox.id, to: emailOutbox.to, subject: emailOutbox.subject, createdAt: emailOutbox.createdAt })
    .from(emailOutbox)
    .where(eq(emailOutbox.transport, "fake"))
    .orderBy(desc(emailOutbox.id))
    .limit(limit);
}

export async function getMessage(id: number) {
  const message = await db.query.emailOutbox.findFirst({ where: eq(emailOutbox.id, id) });
  return message?.transport === "fake" ? message : null;
}
