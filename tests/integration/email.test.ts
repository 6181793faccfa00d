import { createServer, type IncomingMessage, type Server } from "node:http";
import { eq } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { emailOutbox } from "~/db/schema";
import { sendEmail } from "~/server/email.server";
import { invitationEmail, missingResultsReminderEmail, queryRaisedEmail, reviewRequestedEmail, shipmentNoticeEmail } from "~/server/email-templates.server";
import { listMessages, mailboxEnabled } from "~/models/mailbox.server";
import { useFreshDatabase } from "../support/database";

type Received = { method: string; url: string; authorization: string | undefined; body: Record<string, unknown> };

let server: Server;
let baseUrl: string;
const received: Received[] = [];
let reply: { status: number; body: unknown } = { status: 200, body: { id: "stand-in-0001" } };

async function readBody(req: IncomingMessage) {
  let text = "";
  for await (const chunk of req) text += chunk;
  return JSON.parse(text || "{}");
}

beforeAll(async () => {
  await useFreshDatabase();
  // A local stand-in of the provider's send endpoint: records each request and answers like the provider.
  server = createServer(async (req, res) => {
    received.push({ method: req.method!, url: req.url!, authorization: req.headers.authorization, body: await readBody(req) });
    res.writeHead(reply.status, { "Content-Type": "application/json" });
    res.end(JSON.stringify(reply.body));
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  baseUrl = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
});

afterEach(() => {
  delete process.env.RESEND_API_KEY;
  delete process.env.RESEND_BASE_URL;
  received.length = 0;
  reply = { status: 200, body: { id: "stand-in-0001" } };
});

afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

const study = { code: "FF-2027-X", title: "Finishability check", enrollmentDeadline: "2027-02-20", shipDate: "2027-03-10", resultsDue: "2027-04-15" };
const invitation = () =>
  invitationEmail({
    to: "contact@lab.example",
    contactName: "Ada Quell",
    labName: "Quell Lab",
    study,
    workload: { materials: 3, replicates: 2, responses: ["Holes"] },
    coordinator: { name: "Ivo Brandt", email: "ivo@ringbatch.example" },
    url: "http://app.example/invite/abc?study=1",
    expiresOn: "2027-03-01",
  });

describe("e-mail through the provider (resend SDK against a local stand-in)", () => {
  it("posts the composed message with the key and records the provider's id", async () => {
    process.env.RESEND_API_KEY = "re_test_key";
    process.env.RESEND_BASE_URL = baseUrl;
    expect(mailboxEnabled()).toBe(false);
    const message = invitation();
    const row = await sendEmail(message);
    expect(received).toHaveLength(1);
    expect(received[0]!.method).toBe("POST");
    expect(received[0]!.url).toBe("/emails");
    expect(received[0]!.authorization).toBe("Bearer re_test_key");
    expect(received[0]!.body).toMatchObject({ to: message.to, subject: message.subject, html: message.html, text: message.text });
    expect(String(received[0]!.body.from)).toContain("@");
    expect(row.transport).toBe("resend");
    expect(row.providerMessageId).toBe("stand-in-0001");
    expect(row.error).toBeNull();
  });

  it("records the provider's refusal instead of losing the message", async () => {
    process.env.RESEND_API_KEY = "re_test_key";
    process.env.RESEND_BASE_URL = baseUrl;
    reply = { status: 422, body: { name: "validation_error", message: "Invalid `to` field.", statusCode: 422 } };
    const row = await sendEmail(invitation());
    expect(row.transport).toBe("resend");
    expect(row.providerMessageId).toBeNull();
    expect(row.error).toContain("Invalid `to` field.");
  });
});

describe("e-mail through the local fake transport", () => {
  it("stores the same message in the outbox, shown by the mailbox, and sends nothing", async () => {
    expect(mailboxEnabled()).toBe(true);
    const message = invitation();
    const row = await sendEmail(message);
    expect(received).toHaveLength(0);
    const stored = await db.query.emailOutbox.findFirst({ where: eq(emailOutbox.id, row.id) });
    expect(stored).toMatchObject({ ...message, transport: "fake" });
    const admin = { id: 0, email: "admin@ringbatch.example", name: "Admin", role: "admin" as const, roles: ["admin" as const], labIds: [], contactLabIds: [] };
    const listed = (await listMessages(admin)).map((m) => m.id);
    expect(listed).toContain(row.id);
    // Messages that went to the provider (the tests above) are not part of the local mailbox.
    const viaProvider = await db.select({ id: emailOutbox.id }).from(emailOutbox).where(eq(emailOutbox.transport, "resend"));
    expect(viaProvider.length).toBeGreaterThan(0);
    expect(viaProvider.some((r) => listed.includes(r.id))).toBe(false);
  });

  it("builds each message with its link in both the HTML and the text", () => {
    const url = "http://app.example/x?y=1&z=2";
    const messages = [
      invitation(),
      shipmentNoticeEmail({ to: "a@b.example", labName: "Quell Lab", study, items: [{ description: "Portland cement (M1)", quantity: 50, unit: "kg", lot: "C-1", containerCount: 2 }], note: "", carrier: "Kestrel Freight", trackingNumber: "KF-1", shippedOn: "2027-02-01", url }),
      missingResultsReminderEmail({ to: "a@b.example", labName: "Quell Lab", study, missing: ["M1", "M2"], resultsDue: "2027-04-01", url }),
      queryRaisedEmail({ to: "a@b.example", labName: "Quell Lab", study, materialCode: "M2", responseName: "Passes to reach the target surface", question: "Was replicate 3 run on a second batch?", url }),
      reviewRequestedEmail({ to: "a@b.example", reviewerName: "R. Tamsin", study, statementVersion: 2, url }),
    ];
    for (const m of messages.slice(1)) {
      expect(m.text).toContain(url);
      // The HTML escapes the ampersand of the link.
      expect(m.html).toContain("x?y=1&amp;z=2");
      expect(m.subject).toContain(study.code);
    }
    expect(messages[2]!.text).toContain("M1, M2");
    expect(messages[3]!.html).toContain("Was replicate 3 run on a second batch?");
  });
});
