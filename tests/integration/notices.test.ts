import { createClient } from "@libsql/client";
import { and, eq, gt, inArray } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import * as schema from "~/db/schema";
import { emailOutbox, enrollments, labMembers, labs, notices, shipments, studies, users } from "~/db/schema";
import { DUE_SOON_DAYS, runDueNotices } from "~/models/notices.server";
import { noticeSchedulePattern, startNoticeSchedule } from "~/server/notice-schedule.server";
import * as accountPage from "~/routes/account";
import * as receipt from "~/routes/lab/study/receipt";
import * as setup from "~/routes/studies/study/setup";
import * as shipmentsPage from "~/routes/studies/study/shipments";
import { postMultipart } from "../support/coordinator";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { readReply } from "../support/replies";
import { call, get, post } from "../support/routes";

const APP_URL = "https://ringbatch.test";
const DAY = 86_400_000;

let testing: typeof studies.$inferSelect;
let coordinator: string;

beforeAll(async () => {
  process.env.APP_URL = APP_URL;
  await useDemoDatabase();
  testing = await demoStudy("FF-2026-B");
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

/** The mail sent after outbox row `afterId`, optionally only that with a subject containing `subject`. */
async function mailSince(afterId: number, subject = "") {
  const rows = await db.select().from(emailOutbox).where(gt(emailOutbox.id, afterId)).orderBy(emailOutbox.id);
  return rows.filter((row) => row.subject.includes(subject));
}

async function lastMailId() {
  const rows = await db.select({ id: emailOutbox.id }).from(emailOutbox);
  return Math.max(0, ...rows.map((r) => r.id));
}

/** Accounts of the demo labs whose results in the study in testing are not all submitted (the demo: four drafts or not started). */
async function peopleOfLabsWithMissingResults() {
  const submittedLabs = new Set(["L06", "L02", "L08", "L01"]); // seed/seed.ts: labs 0–3 of FF-2026-B submitted everything
  const rows = await db
    .select({ email: users.email, labCode: enrollments.labCode })
    .from(enrollments)
    .innerJoin(labMembers, eq(labMembers.labId, enrollments.labId))
    .innerJoin(users, eq(users.id, labMembers.userId))
    .where(and(eq(enrollments.studyId, testing.id), eq(enrollments.state, "accepted")));
  return rows.filter((r) => !submittedLabs.has(r.labCode!)).map((r) => r.email).sort();
}

const at = (isoDate: string, time = "09:00:00") => new Date(`${isoDate}T${time}Z`);
const shiftDays = (isoDate: string, days: number) => new Date(Date.parse(`${isoDate}T00:00:00Z`) + days * DAY).toISOString().slice(0, 10);

describe("reminders before and after results are due", () => {
  it("reminds each lab with missing results once, a week before the due date and again once overdue", async () => {
    const due = testing.resultsDue!; // 2027-01-29 in the demo
    const expected = await peopleOfLabsWithMissingResults();
    expect(expected.length).toBeGreaterThan(0);

    // Eight days before: too early.
    let before = await lastMailId();
    await runDueNotices(db, at(shiftDays(due, -(DUE_SOON_DAYS + 1))));
    expect(await mailSince(before, "results due on")).toEqual([]);

    // Seven days before, twice: each person of each lab with missing results gets the reminder once.
    before = await lastMailId();
    const sevenDaysBefore = at(shiftDays(due, -DUE_SOON_DAYS));
    const first = await runDueNotices(db, sevenDaysBefore);
    const second = await runDueNotices(db, sevenDaysBefore);
    expect(second.sent).toBe(0);
    const reminders = await mailSince(before, `results due on ${due}`);
    expect(first.sent).toBe(reminders.length);
    expect(reminders.map((m) => m.to).sort()).toEqual(expected);
    expect(reminders[0]!.text).toContain(`${APP_URL}/lab/studies/${testing.id}`);
    expect(reminders[0]!.text).toContain(`${APP_URL}/account`);

    // The day after the due date, twice: the overdue notice, once each.
    before = await lastMailId();
    await runDueNotices(db, at(shiftDays(due, 1)));
    await runDueNotices(db, at(shiftDays(due, 1), "15:00:00"));
    const overdue = await mailSince(before, `results overdue since ${due}`);
    expect(overdue.map((m) => m.to).sort()).toEqual(expected);
    expect(await mailSince(before, "results due on")).toEqual([]);
  });

  it("sends each notice once when two app instances run the same tick at once", async () => {
    // A new due date is a new occasion to remind; the second instance has its own connection to the same database.
    const due = "2027-02-12";
    await db.update(studies).set({ resultsDue: due }).where(eq(studies.id, testing.id));
    const otherInstance = createClient({ url: process.env.DATABASE_URL!, timeout: 5000 });
    try {
      const before = await lastMailId();
      const now = at(shiftDays(due, -3));
      const [a, b] = await Promise.all([runDueNotices(db, now), runDueNotices(drizzle(otherInstance, { schema }), now)]);
      const sent = await mailSince(before, `results due on ${due}`);
      const expected = await peopleOfLabsWithMissingResults();
      expect(sent.map((m) => m.to).sort()).toEqual(expected);
      expect(a.sent + b.sent).toBe(expected.length);
      const claims = await db.select().from(notices).where(and(eq(notices.kind, "results_due_soon"), eq(notices.studyId, testing.id)));
      expect(claims.filter((c) => c.uniqueKey.includes(due)).every((c) => c.emailId !== null)).toBe(true);
    } finally {
      otherInstance.close();
    }
  });
});

describe("the schedule", () => {
  it("is every five minutes unless NOTICE_SCHEDULE says otherwise, and off turns it off", () => {
    expect(noticeSchedulePattern({})).toBe("*/5 * * * *");
    expect(noticeSchedulePattern({ NOTICE_SCHEDULE: "0 * * * *" })).toBe("0 * * * *");
    expect(noticeSchedulePattern({ NOTICE_SCHEDULE: "off" })).toBeNull();
    expect(startNoticeSchedule(null)).toBeNull();
  });

  it("sends the due notices on its own once started", async () => {
    // Results due in three days from the real clock: the schedule's tick (every second here) finds the reminders.
    const due = new Date(Date.now() + 3 * DAY).toISOString().slice(0, 10);
    await db.update(studies).set({ resultsDue: due }).where(eq(studies.id, testing.id));
    const before = await lastMailId();
    const job = startNoticeSchedule("* * * * * *")!;
    try {
      await expect.poll(async () => (await mailSince(before, `results due on ${due}`)).length, { timeout: 10_000 }).toBe((await peopleOfLabsWithMissingResults()).length);
    } finally {
      job.stop();
    }
  });
});

describe("notices to the coordinator", () => {
  const inTransit = async () =>
    db
      .select({ id: shipments.id, enrollmentId: shipments.enrollmentId, contactEmail: labs.contactEmail })
      .from(shipments)
      .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(and(eq(enrollments.studyId, testing.id), eq(shipments.status, "shipped")));

  it("turns the optional notices off from the account page, refusing a malformed answer", async () => {
    const page = await call(accountPage.loader, get("/account", coordinator));
    expect(page.data.notices).toEqual({ resultReminders: true, enrollmentAnswers: true });
    const refused = await readReply(await call(accountPage.action, post("/account", { intent: "notices", resultReminders: "yes" }, coordinator)));
    expect(refused.status).toBe(400);
    expect(refused.errors.resultReminders).toBe("Tick the box or leave it empty.");
    const saved = await readReply(await call(accountPage.action, post("/account", { intent: "notices", resultReminders: "on" }, coordinator)));
    expect(saved.done).toBe("Your e-mail notices are saved.");
    expect((await call(accountPage.loader, get("/account", coordinator))).data.notices).toEqual({ resultReminders: true, enrollmentAnswers: false });
  });

  it("tells the coordinator once about a lost and a damaged shipment, and about answers only to those who want them", async () => {
    const [lost, damaged] = await inTransit();
    expect((await readReply(await call(shipmentsPage.action, post(`/studies/${testing.id}/shipments`, { intent: "lost", shipmentId: String(lost!.id) }, coordinator), { studyId: String(testing.id) }))).done).toBe(
      "Marked lost in transit.",
    );
    const form = new FormData();
    for (const [k, v] of Object.entries({ shipmentId: String(damaged!.id), receivedOn: "2026-11-26", condition: "damaged", receiptNotes: "Two fiber cartons crushed." })) form.set(k, v);
    const confirmed = await call(receipt.action, postMultipart(`/lab/studies/${testing.id}/receipt`, form, await demoCookie(damaged!.contactEmail)), { studyId: String(testing.id) });
    expect(confirmed.status).toBe(302);

    // A lab outside the demo answers an invitation: one accepts, one declines.
    const [accepting, declining] = await db.insert(labs).values([{ name: "Fenmoor Paving Lab" }, { name: "Skelbrook Site Lab" }]).returning();
    const now = new Date();
    await db.insert(enrollments).values([
      { studyId: testing.id, labId: accepting!.id, state: "accepted", labCode: "L09", respondedAt: now },
      { studyId: testing.id, labId: declining!.id, state: "declined", respondedAt: now },
    ]);

    const before = await lastMailId();
    const tick = new Date(now.getTime() + 60_000);
    await runDueNotices(db, tick);
    await runDueNotices(db, tick);
    const toCoordinator = (await mailSince(before)).filter((m) => m.to === "coordinator@ringbatch.example");
    const subjects = toCoordinator.map((m) => m.subject).sort();
    expect(subjects.filter((s) => s.includes("lost"))).toHaveLength(1);
    expect(subjects.filter((s) => s.includes("arrived damaged"))).toHaveLength(1);
    // The coordinator turned acceptances and declines off above.
    expect(subjects.filter((s) => s.includes("the invitation"))).toEqual([]);
    const damagedNotice = toCoordinator.find((m) => m.subject.includes("arrived damaged"))!;
    expect(damagedNotice.text).toContain("Two fiber cartons crushed.");
    expect(damagedNotice.text).toContain(`${APP_URL}/studies/${testing.id}/shipments`);

    // With the answers turned back on, the next tick still sends them: they were never claimed for this person.
    await call(accountPage.action, post("/account", { intent: "notices", resultReminders: "on", enrollmentAnswers: "on" }, coordinator));
    const again = await lastMailId();
    await runDueNotices(db, tick);
    await runDueNotices(db, tick);
    const answers = (await mailSince(again)).filter((m) => m.to === "coordinator@ringbatch.example").map((m) => m.subject).sort();
    expect(answers).toEqual([`${testing.code}: Fenmoor Paving Lab accepted the invitation`, `${testing.code}: Skelbrook Site Lab declined the invitation`]);
    expect((await mailSince(again)).find((m) => m.subject.includes("Fenmoor"))!.text).toContain(`${APP_URL}/studies/${testing.id}/labs`);
  });

  it("leaves events older than the lookback alone", async () => {
    // The demo's enrollments answered in July 2026 and its shipments were received in September: a run now sends nothing about them.
    const before = await lastMailId();
    await runDueNotices(db, new Date(Date.now() + 10 * DAY));
    const sent = await mailSince(before);
    expect(sent.filter((m) => m.subject.includes("invitation") || m.subject.includes("shipment"))).toEqual([]);
    const demoAnswers = await db.select({ id: notices.id }).from(notices).where(inArray(notices.kind, ["enrollment_accepted", "enrollment_declined"]));
    expect(demoAnswers).toHaveLength(2);
  });
});

describe("notices to a co-coordinator", () => {
  it("reach every coordinator of the study once each, as each one's own settings say, and never a disabled account", async () => {
    await db.insert(users).values([
      { email: "coord-b@ringbatch.example", name: "Ines Marlowe", role: "coordinator" },
      { email: "coord-c@ringbatch.example", name: "Pell Ardington", role: "coordinator" },
    ]);
    for (const email of ["coord-b@ringbatch.example", "coord-c@ringbatch.example"]) {
      const added = await readReply(await call(setup.action, post(`/studies/${testing.id}/setup`, { intent: "coordinator-add", email }, coordinator), { studyId: String(testing.id) }));
      expect(added.done).toBe(`${email} added.`);
    }
    // The second co-coordinator keeps result reminders but turns answers off; the third account is then disabled.
    const secondCookie = await demoCookie("coord-b@ringbatch.example");
    await call(accountPage.action, post("/account", { intent: "notices", resultReminders: "on" }, secondCookie));
    await db.update(users).set({ disabledAt: new Date() }).where(eq(users.email, "coord-c@ringbatch.example"));

    const [lab] = await db.insert(labs).values({ name: "Orrin Vale Test House" }).returning();
    const now = new Date();
    await db.insert(enrollments).values({ studyId: testing.id, labId: lab!.id, state: "accepted", labCode: "L10", respondedAt: now });
    const before = await lastMailId();
    await runDueNotices(db, new Date(now.getTime() + 60_000));
    await runDueNotices(db, new Date(now.getTime() + 120_000));
    const about = (await mailSince(before, "Orrin Vale Test House accepted the invitation")).map((m) => m.to);
    expect(about).toEqual(["coordinator@ringbatch.example"]);

    // With answers back on, the co-coordinator gets the same notice on the next tick, once; the owner is not told twice.
    await call(accountPage.action, post("/account", { intent: "notices", resultReminders: "on", enrollmentAnswers: "on" }, secondCookie));
    const again = await lastMailId();
    await runDueNotices(db, new Date(now.getTime() + 180_000));
    await runDueNotices(db, new Date(now.getTime() + 240_000));
    const notice = await mailSince(again, "Orrin Vale Test House accepted the invitation");
    expect(notice.map((m) => m.to)).toEqual(["coord-b@ringbatch.example"]);
    expect(notice[0]!.text).toContain(`${APP_URL}/studies/${testing.id}/labs`);
  });
});
