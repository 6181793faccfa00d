import { createHash } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { emailOutbox, enrollments, invitations, labs, studies, users } from "~/db/schema";
import { drawLabCode } from "~/server/lab-codes.server";
import * as mailbox from "~/routes/dev/mailbox";
import * as mailboxMessage from "~/routes/dev/mailbox-message";
import * as invite from "~/routes/auth/invite";
import * as labsPage from "~/routes/studies/study/labs";
import { seedDemo } from "../../seed/seed";
import { createStudyAs } from "../support/coordinator";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { readReply } from "../support/replies";
import { call, cookieFrom, get, post } from "../support/routes";
import { errorsOf } from "../support/replies";

let coordinator: string;
let study: typeof studies.$inferSelect;
let otherStudy: typeof studies.$inferSelect;
let newLab: typeof labs.$inferSelect;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  coordinator = await demoCookie("coordinator@ringbatch.example");
  study = await createStudyAs(coordinator, { code: "FF-2027-L" });
  otherStudy = await createStudyAs(coordinator, { code: "FF-2027-M" });
  [newLab] = await db.insert(labs).values({ name: "Fennick Test Bench", contactName: "Ivo Fennick", contactEmail: "ivo@fennick.example" }).returning();
});

const inviteLab = async (s: typeof study, labId: number, cookie = coordinator) =>
  readReply(await call(labsPage.action, post(`/studies/${s.id}/labs`, { intent: "invite", labId: String(labId) }, cookie), { studyId: String(s.id) }));

/** The link of the newest message to an address, as the recipient would click it. */
async function latestLink(to: string) {
  const [message] = await db.select().from(emailOutbox).where(eq(emailOutbox.to, to)).orderBy(desc(emailOutbox.id)).limit(1);
  const url = new URL(/https?:\/\/\S+\/invite\/\S+/.exec(message!.text)![0]);
  return { path: url.pathname + url.search, token: url.pathname.split("/").pop()!, study: url.searchParams.get("study")! };
}

const openInvite = (link: { path: string; token: string }, cookie?: string) => call(invite.loader, get(link.path, cookie), { token: link.token });
const answer = (link: { path: string; token: string }, fields: Record<string, string>, cookie?: string) => call(invite.action, post(link.path, fields, cookie), { token: link.token });

describe("inviting labs", () => {
  it("waits for recruiting, and needs a lab with a contact e-mail", async () => {
    expect((await inviteLab(study, newLab.id)).errors.labId).toBe("Labs can be invited only while the study is recruiting.");
    await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, study.id));
    study.state = "recruiting";
    await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, otherStudy.id));
    const [noContact] = await db.insert(labs).values({ name: "Nocontact Lab" }).returning();
    expect((await inviteLab(study, noContact!.id)).errors.labId).toContain("no contact e-mail");
    expect((await inviteLab(study, 999999)).errors.labId).toBe("Choose a lab from the directory.");
    expect((await inviteLab(study, Number.NaN)).status).toBe(400);
    expect((await inviteLab(study, newLab.id, await demoCookie("admin@ringbatch.example"))).status).toBe(404);
  });

  it("e-mails the contact a single-use link whose token is stored only as its SHA-256", async () => {
    const outcome = await inviteLab(study, newLab.id);
    expect(outcome.done).toBe("Invitation sent to the lab's contact.");
    const link = await latestLink("ivo@fennick.example");
    // 32 random bytes in base64url are 43 characters.
    expect(link.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(link.study).toBe(String(study.id));
    const stored = await db.select().from(invitations);
    expect(stored.map((i) => i.tokenHash)).toContain(createHash("sha256").update(link.token).digest("hex"));
    expect(stored.some((i) => i.tokenHash.includes(link.token))).toBe(false);
    const row = stored.find((i) => i.tokenHash === createHash("sha256").update(link.token).digest("hex"))!;
    expect(row.expiresAt.getTime() - Date.now()).toBeGreaterThan(13.9 * 24 * 3600 * 1000);
    expect(row.expiresAt.getTime() - Date.now()).toBeLessThanOrEqual(14 * 24 * 3600 * 1000);
    const listing = await call(labsPage.loader, get(`/studies/${study.id}/labs`, coordinator), { studyId: String(study.id) });
    expect(listing.data.rows.find((r: { id: number }) => r.id === newLab.id).enrollmentState).toBe("invited");
  });

  it("refuses a token opened for another study", async () => {
    const link = await latestLink("ivo@fennick.example");
    const wrong = { ...link, path: `/invite/${link.token}?study=${otherStudy.id}` };
    const outcome = await openInvite(wrong);
    expect(outcome.status).toBe(404);
    expect(outcome.data.refusal.title).toBe("This invitation belongs to another study");
    expect((await answer(wrong, { intent: "accept", name: "Ivo Fennick", password: "a-long-enough-password", confirm: "a-long-enough-password" })).status).toBe(404);
    expect((await openInvite({ path: `/invite/not-a-token?study=${study.id}`, token: "not-a-token" })).data.refusal.title).toBe("This invitation link is not valid");
  });

  it("lets a new contact set a password and accept, signs them in, and draws a blind lab code", async () => {
    const link = await latestLink("ivo@fennick.example");
    const page = await openInvite(link);
    expect(page.status).toBe(200);
    expect(page.data.invitation).toMatchObject({ labName: "Fennick Test Bench", email: "ivo@fennick.example", needsPassword: true });
    const short = await answer(link, { intent: "accept", name: "Ivo Fennick", password: "short", confirm: "short" });
    expect(errorsOf(short).password).toBe("Use at least 12 characters.");
    const differ = await answer(link, { intent: "accept", name: "Ivo Fennick", password: "a-long-enough-password", confirm: "another-long-password" });
    expect(errorsOf(differ).confirm).toBe("The two passwords differ.");
    expect(errorsOf(await answer(link, { intent: "accept", name: "", password: "a-long-enough-password", confirm: "a-long-enough-password" })).name).toBe("Enter a name.");
    const accepted = await answer(link, { intent: "accept", name: "Ivo Fennick", password: "a-long-enough-password", confirm: "a-long-enough-password" });
    expect(accepted.status).toBe(302);
    expect(accepted.headers.get("Location")).toBe("/lab");
    expect(cookieFrom(accepted.headers)).toMatch(/^__ringbatch_session=/);
    const user = (await db.query.users.findFirst({ where: eq(users.email, "ivo@fennick.example") }))!;
    expect(user.role).toBe("analyst");
    const enrollment = (await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, newLab.id)) }))!;
    expect(enrollment.state).toBe("accepted");
    expect(enrollment.labCode).toMatch(/^L\d{2}$/);
  });

  it("refuses the same link a second time", async () => {
    const link = await latestLink("ivo@fennick.example");
    const again = await openInvite(link);
    expect(again.status).toBe(410);
    expect(again.data.refusal.title).toBe("This invitation has already been used");
    expect((await answer(link, { intent: "decline" })).status).toBe(410);
  });

  it("refuses an expired link", async () => {
    const demoLab = (await db.query.labs.findFirst({ where: eq(labs.contactEmail, "analyst2@ringbatch.example") }))!;
    await inviteLab(study, demoLab.id);
    const link = await latestLink("analyst2@ringbatch.example");
    await db.update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.tokenHash, createHash("sha256").update(link.token).digest("hex")));
    const outcome = await openInvite(link);
    expect(outcome.status).toBe(410);
    expect(outcome.data.refusal.title).toBe("This invitation has expired");
  });

  it("asks an existing account to sign in, accepts once signed in, and lets another lab decline", async () => {
    const lab3 = (await db.query.labs.findFirst({ where: eq(labs.contactEmail, "analyst3@ringbatch.example") }))!;
    await inviteLab(study, lab3.id);
    const link = await latestLink("analyst3@ringbatch.example");
    expect((await openInvite(link)).data.invitation.needsPassword).toBe(false);
    const signedOut = await answer(link, { intent: "accept" });
    expect(signedOut.status).toBe(403);
    expect(errorsOf(signedOut)[""]).toBe("Sign in as analyst3@ringbatch.example to accept.");
    const wrongPerson = await answer(link, { intent: "accept" }, await demoCookie("analyst4@ringbatch.example"));
    expect(wrongPerson.status).toBe(403);
    const accepted = await answer(link, { intent: "accept" }, await demoCookie("analyst3@ringbatch.example"));
    expect(accepted.status).toBe(302);

    const lab4 = (await db.query.labs.findFirst({ where: eq(labs.contactEmail, "analyst4@ringbatch.example") }))!;
    await inviteLab(study, lab4.id);
    const declineLink = await latestLink("analyst4@ringbatch.example");
    expect((await answer(declineLink, { intent: "decline" })).data.declined).toBe(true);
    const declined = (await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, lab4.id)) }))!;
    expect(declined).toMatchObject({ state: "declined", labCode: null });
    const codes = (await db.select().from(enrollments).where(eq(enrollments.studyId, study.id))).map((e) => e.labCode).filter(Boolean);
    expect(new Set(codes).size).toBe(codes.length);
    expect((await inviteLab(study, lab3.id)).errors.labId).toBe("This lab has already accepted.");
  });
});

describe("blind lab codes", () => {
  it("never repeat a taken code and use every free code of a range much wider than the number of labs", () => {
    const taken = new Set(["L01", "L03"]);
    const drawn = new Set(Array.from({ length: 400 }, (_, i) => drawLabCode(taken, 4, (max) => i % max)));
    expect(drawn.size).toBe(97);
    expect(drawn.has("L01") || drawn.has("L03")).toBe(false);
    expect([...drawn].sort().at(-1)).toBe("L99");
    // A large study draws from three times its number of labs.
    expect(drawLabCode(new Set(), 40, (max) => max - 1)).toBe("L120");
  });
});

describe("the local mailbox", () => {
  it("lists and shows messages to coordinators and admins only", async () => {
    const list = await call(mailbox.loader, get("/dev/mailbox", coordinator));
    expect(list.status).toBe(200);
    const first = list.data.messages.find((m: { to: string }) => m.to === "ivo@fennick.example");
    expect(first.subject).toBe("Invitation to interlaboratory study FF-2027-L");
    const shown = await call(mailboxMessage.loader, get(`/dev/mailbox/${first.id}`, await demoCookie("admin@ringbatch.example")), { messageId: String(first.id) });
    expect(shown.data.message.text).toContain("/invite/");
    for (const email of ["analyst1@ringbatch.example", "reviewer1@ringbatch.example"]) {
      expect((await call(mailbox.loader, get("/dev/mailbox", await demoCookie(email)))).status).toBe(404);
      expect((await call(mailboxMessage.loader, get(`/dev/mailbox/${first.id}`, await demoCookie(email)), { messageId: String(first.id) })).status).toBe(404);
    }
    expect((await call(mailboxMessage.loader, get("/dev/mailbox/999999", coordinator), { messageId: "999999" })).status).toBe(404);
  });

  it("is gone while a real provider key is set", async () => {
    process.env.RESEND_API_KEY = "re_configured";
    try {
      expect((await call(mailbox.loader, get("/dev/mailbox", coordinator))).status).toBe(404);
    } finally {
      delete process.env.RESEND_API_KEY;
    }
  });
});
