/**
 * Outgoing e-mail. Every message is built the same way and goes through one
 * `sendEmail`; only the last step differs: with `RESEND_API_KEY` set it goes to
 * the provider (the SDK honours `RESEND_BASE_URL`, so tests can stand in for it),
 * without it the fake transport keeps it, and `/dev/mailbox` shows it.
 * Either way the message is recorded in the outbox.
 */
import { Resend } from "resend";
import { db } from "~/db/client.server";
import { emailOutbox } from "~/db/schema";

export type EmailMessage = { to: string; subject: string; html: string; text: string };

export function emailTransport(env: NodeJS.ProcessEnv = process.env): "resend" | "fake" {
  return env.RESEND_API_KEY ? "resend" : "fake";
}

const FROM = process.env.EMAIL_FROM ?? "Ringbatch <studies@ringbatch.example>";

/** Sends a message; `studyId` names the study it is about, which decides who may read it in the local mailbox. */
export async function sendEmail(message: EmailMessage, { studyId = null }: { studyId?: number | null } = {}) {
  const transport = emailTransport();
  let providerMessageId: string | null = null;
  let error: string | null = null;
  if (transport === "resend") {
    const resend = new Resend(process.env.RESEND_API_KEY);
    const sent = await resend.emails.send({ from: FROM, ...message });
    providerMessageId = sent.data?.id ?? null;
    error = sent.error ? `${sent.error.name}: ${sent.error.message}` : null;
  }
  const [row] = await db.insert(emailOutbox).values({ ...message, studyId, transport, providerMessageId, error }).returning();
  return row!;
}

function escapeHtml(value: string) {
  return value.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

export type EmailContent = {
  to: string;
  subject: string;
  greeting: string;
  paragraphs: string[];
  action?: { label: string; url: string };
};

/** One plain layout for every message, as HTML and as text. */
export function composeEmail({ to, subject, greeting, paragraphs, action }: EmailContent): EmailMessage {
  const footer = "You receive this because you take part in a Ringbatch interlaboratory study.";
  const html = [
    `<div style="font-family:'Noto Sans',Arial,sans-serif;color:#13262c;max-width:560px">`,
    `<p style="font-weight:700;color:#1c343c">Ringbatch</p>`,
    `<p>${escapeHtml(greeting)}</p>`,
    ...paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    action
      ? `<p><a href="${escapeHtml(action.url)}" style="background:#27454f;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(action.label)}</a></p><p style="font-size:13px">${escapeHtml(action.url)}</p>`
      : "",
    `<p style="font-size:13px;color:#4d6f7a">${footer}</p>`,
    `</div>`,
  ].join("");
  const text = [greeting, "", ...paragraphs.flatMap((p) => [p, ""]), action ? `${action.label}: ${action.url}\n` : "", footer].join("\n");
  return { to, subject, html, text };
}

/**
 * An absolute link into the app, from APP_URL (required in production, so a
 * forged Host header never chooses where links point); during development,
 * from the request that caused the message.
 */
export function appUrl(request: Request | null, path: string) {
  const base = process.env.APP_URL || (request ? new URL(request.url).origin : "http://localhost:3000");
  return new URL(path, base).toString();
}
