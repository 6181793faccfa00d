/**
 * E-mails sent on a schedule: to a study's coordinators when a shipment is
 * reported damaged or marked lost and when a lab accepts or declines; to a
 * lab when results are due within a week and again when they are overdue.
 *
 * `runDueNotices(database, now)` is the whole tick: it works out which notices
 * are due at `now` and sends each one that no run has claimed yet. A claim is
 * an INSERT into `notices` that does nothing when the unique key is already
 * there, made before the e-mail goes out, so two app instances running the
 * same tick at once send each notice once. The scheduler (notice-schedule.server)
 * only calls it.
 */
import { and, eq, gte, inArray, isNotNull, lte, or } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import {
  auditEvents,
  cells,
  enrollments,
  labMembers,
  labs,
  materials,
  noticePreferences,
  notices,
  responses,
  shipments,
  studies,
  studyCoordinators,
  users,
  type NOTICE_KINDS,
} from "~/db/schema";
import { todayIso } from "~/lib/format";
import { WRITE_RULES } from "~/lib/write-rules";
import { appUrl, type EmailMessage, sendEmail } from "~/server/email.server";
import { enrollmentAnswerEmail, resultsDueEmail, shipmentProblemEmail } from "~/server/email-templates.server";

type NoticeKind = (typeof NOTICE_KINDS)[number];

/** Events older than this when a run first sees them are not announced (say, after the schedule was off for a while). */
const EVENT_LOOKBACK_MS = 3 * 24 * 60 * 60 * 1000;
/** Labs are reminded this many days before results are due. */
export const DUE_SOON_DAYS = 7;

type Recipient = { email: string; name: string; resultReminders: boolean; enrollmentAnswers: boolean };
type Notice = { kind: NoticeKind; studyId: number; subjectId: number; key: string; to: Recipient; message: (to: Recipient) => EmailMessage };

/** The notices a person may turn off, and the preference that does. */
const OPTIONAL: Partial<Record<NoticeKind, keyof Pick<Recipient, "resultReminders" | "enrollmentAnswers">>> = {
  results_due_soon: "resultReminders",
  results_overdue: "resultReminders",
  enrollment_accepted: "enrollmentAnswers",
  enrollment_declined: "enrollmentAnswers",
};

/** One notice per recipient about the same subject; `occasion` tells a repeated event apart (a new answer, a new due date). */
function noticesFor(
  recipients: Recipient[] | undefined,
  { kind, studyId, subjectId, occasion }: { kind: NoticeKind; studyId: number; subjectId: number; occasion?: string | number },
  message: (to: Recipient) => EmailMessage,
): Notice[] {
  const key = (email: string) => [kind, subjectId, ...(occasion === undefined ? [] : [occasion]), email].join(":");
  return (recipients ?? []).map((to) => ({ kind, studyId, subjectId, key: key(to.email), to, message }));
}

const wanted = (notice: Notice) => {
  const preference = OPTIONAL[notice.kind];
  return preference === undefined || notice.to[preference];
};

/** Preferences default to on: a person without a row gets every notice. */
const withDefaults = (rows: { email: string; name: string; resultReminders: boolean | null; enrollmentAnswers: boolean | null }[]): Recipient[] =>
  rows.map(({ email, name, resultReminders, enrollmentAnswers }) => ({ email, name, resultReminders: resultReminders ?? true, enrollmentAnswers: enrollmentAnswers ?? true }));

/** Who a notice may go to, with their preferences (null when they never chose). */
const personColumns = {
  email: users.email,
  name: users.name,
  disabledAt: users.disabledAt,
  resultReminders: noticePreferences.resultReminders,
  enrollmentAnswers: noticePreferences.enrollmentAnswers,
};

/** The owner and the co-coordinators of each study, active accounts only. */
async function coordinatorsOf(database: Database, studyIds: number[]) {
  const byStudy = new Map<number, Recipient[]>();
  if (studyIds.length === 0) return byStudy;
  // The owner comes once per co-coordinator row; the e-mail address keeps each person once.
  const rows = await database
    .select({ studyId: studies.id, ...personColumns })
    .from(studies)
    .leftJoin(studyCoordinators, eq(studyCoordinators.studyId, studies.id))
    .innerJoin(users, or(eq(users.id, studies.ownerId), eq(users.id, studyCoordinators.userId)))
    .leftJoin(noticePreferences, eq(noticePreferences.userId, users.id))
    .where(inArray(studies.id, studyIds));
  for (const { studyId, disabledAt, ...person } of rows) {
    const list = byStudy.get(studyId) ?? [];
    if (!disabledAt && !list.some((p) => p.email === person.email)) list.push(...withDefaults([person]));
    byStudy.set(studyId, list);
  }
  return byStudy;
}

/** A lab's members with active accounts; a lab without any is written to at its contact address. */
async function labPeopleOf(database: Database, labIds: number[]) {
  const byLab = new Map<number, Recipient[]>();
  if (labIds.length === 0) return byLab;
  const [members, contacts] = await Promise.all([
    database
      .select({ labId: labMembers.labId, ...personColumns })
      .from(labMembers)
      .innerJoin(users, eq(users.id, labMembers.userId))
      .leftJoin(noticePreferences, eq(noticePreferences.userId, users.id))
      .where(inArray(labMembers.labId, labIds)),
    database.select({ labId: labs.id, name: labs.name, email: labs.contactEmail }).from(labs).where(inArray(labs.id, labIds)),
  ]);
  for (const lab of contacts) {
    const active = withDefaults(members.filter((m) => m.labId === lab.labId && !m.disabledAt));
    byLab.set(lab.labId, active.length > 0 ? active : lab.email ? [{ email: lab.email, name: `${lab.name} team`, resultReminders: true, enrollmentAnswers: true }] : []);
  }
  return byLab;
}

/** Damaged receipts and lost shipments reported since the lookback began. */
async function shipmentProblems(database: Database, now: Date): Promise<Notice[]> {
  const events = await database
    .select({ entityId: auditEvents.entityId })
    .from(auditEvents)
    .where(
      and(
        inArray(auditEvents.action, ["shipment_received", "shipment_receipt_corrected", "shipment_lost"]),
        eq(auditEvents.entityType, "shipment"),
        gte(auditEvents.createdAt, new Date(now.getTime() - EVENT_LOOKBACK_MS)),
        lte(auditEvents.createdAt, now),
      ),
    );
  const ids = [...new Set(events.map((e) => Number(e.entityId)))].filter(Number.isSafeInteger);
  if (ids.length === 0) return [];
  const found = await database
    .select({ id: shipments.id, status: shipments.status, condition: shipments.condition, receiptNotes: shipments.receiptNotes, studyId: enrollments.studyId, labCode: enrollments.labCode, labName: labs.name, study: { code: studies.code, title: studies.title } })
    .from(shipments)
    .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .innerJoin(studies, eq(studies.id, enrollments.studyId))
    .where(inArray(shipments.id, ids));
  const problems = found.filter((s) => s.status === "lost" || s.condition === "damaged");
  const coordinators = await coordinatorsOf(database, problems.map((s) => s.studyId));
  return problems.flatMap((s) => {
    const kind: NoticeKind = s.status === "lost" ? "shipment_lost" : "shipment_damaged";
    return noticesFor(coordinators.get(s.studyId), { kind, studyId: s.studyId, subjectId: s.id }, (person) =>
      shipmentProblemEmail({ to: person.email, name: person.name, study: s.study, lab: s.labCode ? `${s.labName} (${s.labCode})` : s.labName, lost: kind === "shipment_lost", notes: s.receiptNotes, url: appUrl(null, `/studies/${s.studyId}/shipments`) }),
    );
  });
}

/** Invitations accepted or declined since the lookback began; a lab invited again and answering again is a new answer. */
async function enrollmentAnswers(database: Database, now: Date): Promise<Notice[]> {
  const answered = await database
    .select({ id: enrollments.id, state: enrollments.state, respondedAt: enrollments.respondedAt, studyId: enrollments.studyId, labName: labs.name, study: { code: studies.code, title: studies.title } })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .innerJoin(studies, eq(studies.id, enrollments.studyId))
    .where(
      and(
        inArray(enrollments.state, ["accepted", "declined"]),
        isNotNull(enrollments.respondedAt),
        gte(enrollments.respondedAt, new Date(now.getTime() - EVENT_LOOKBACK_MS)),
        lte(enrollments.respondedAt, now),
      ),
    );
  const coordinators = await coordinatorsOf(database, answered.map((e) => e.studyId));
  return answered.flatMap((e) => {
    const kind: NoticeKind = e.state === "accepted" ? "enrollment_accepted" : "enrollment_declined";
    return noticesFor(coordinators.get(e.studyId), { kind, studyId: e.studyId, subjectId: e.id, occasion: e.respondedAt!.getTime() }, (person) =>
      enrollmentAnswerEmail({ to: person.email, name: person.name, study: e.study, labName: e.labName, accepted: kind === "enrollment_accepted", url: appUrl(null, `/studies/${e.studyId}/labs`), preferencesUrl: appUrl(null, "/account") }),
    );
  });
}

const dayNumber = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / 86_400_000;

/**
 * Labs of studies taking results whose results are not all submitted: a
 * reminder once when the due date is a week away or nearer, and once when it
 * has passed. A new due date is a new occasion to remind.
 */
async function resultsDue(database: Database, now: Date): Promise<Notice[]> {
  const today = todayIso(now);
  const open = await database
    .select({ id: studies.id, code: studies.code, title: studies.title, resultsDue: studies.resultsDue })
    .from(studies)
        // Precision studies only: a proficiency round's labs work from the round pages, with their own dates.
    .where(and(eq(studies.kind, "precision"), inArray(studies.state, [...WRITE_RULES.results.open]), isNotNull(studies.resultsDue)));
  const due = open.filter((s) => dayNumber(s.resultsDue!) - dayNumber(today) <= DUE_SOON_DAYS);
  if (due.length === 0) return [];
  const studyIds = due.map((s) => s.id);
  const [labRows, materialRows, responseRows, submitted] = await Promise.all([
    database
      .select({ enrollmentId: enrollments.id, studyId: enrollments.studyId, labId: enrollments.labId, labName: labs.name })
      .from(enrollments)
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(and(inArray(enrollments.studyId, studyIds), eq(enrollments.state, "accepted"))),
    database.select({ id: materials.id, studyId: materials.studyId, code: materials.code }).from(materials).where(inArray(materials.studyId, studyIds)).orderBy(materials.sortOrder, materials.code),
    database.select({ studyId: responses.studyId }).from(responses).where(inArray(responses.studyId, studyIds)),
    database
      .select({ enrollmentId: cells.enrollmentId, materialId: cells.materialId })
      .from(cells)
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(and(inArray(enrollments.studyId, studyIds), eq(cells.status, "submitted"))),
  ]);
  const people = await labPeopleOf(database, [...new Set(labRows.map((l) => l.labId))]);
  return labRows.flatMap((lab) => {
    const study = due.find((s) => s.id === lab.studyId)!;
    const responseCount = responseRows.filter((r) => r.studyId === lab.studyId).length;
    const missing = materialRows
      .filter((m) => m.studyId === lab.studyId)
      .filter((m) => submitted.filter((c) => c.enrollmentId === lab.enrollmentId && c.materialId === m.id).length < responseCount)
      .map((m) => m.code);
    if (missing.length === 0) return [];
    const overdue = today > study.resultsDue!;
    const kind: NoticeKind = overdue ? "results_overdue" : "results_due_soon";
    return noticesFor(people.get(lab.labId), { kind, studyId: study.id, subjectId: lab.enrollmentId, occasion: study.resultsDue! }, (person) =>
      resultsDueEmail({ to: person.email, name: person.name, labName: lab.labName, study, missing, resultsDue: study.resultsDue!, overdue, url: appUrl(null, `/lab/studies/${study.id}`), preferencesUrl: appUrl(null, "/account") }),
    );
  });
}

/** Claims the notice, then sends it; false when another run claimed it first. A failed send gives the claim back for the next run. */
async function deliverOnce(database: Database, notice: Notice) {
  const [claim] = await database
    .insert(notices)
    .values({ kind: notice.kind, studyId: notice.studyId, subjectId: notice.subjectId, recipient: notice.to.email, uniqueKey: notice.key })
    .onConflictDoNothing({ target: notices.uniqueKey })
    .returning({ id: notices.id });
  if (!claim) return false;
  try {
    const email = await sendEmail(notice.message(notice.to), { studyId: notice.studyId });
    await database.update(notices).set({ emailId: email.id }).where(eq(notices.id, claim.id));
    return true;
  } catch (error) {
    await database.delete(notices).where(eq(notices.id, claim.id));
    console.error(`Notice ${notice.key} not sent; the next run tries again.`, error);
    return false;
  }
}

/** One tick of the schedule: every notice due at `now` that nobody has sent yet. Returns how many this run sent. */
export async function runDueNotices(database: Database, now: Date) {
  const due = [...(await shipmentProblems(database, now)), ...(await enrollmentAnswers(database, now)), ...(await resultsDue(database, now))].filter(wanted);
  let sent = 0;
  for (const notice of due) if (await deliverOnce(database, notice)) sent += 1;
  return { sent };
}

export type NoticePreferences = { resultReminders: boolean; enrollmentAnswers: boolean };

export async function noticePreferencesOf(database: Database, userId: number): Promise<NoticePreferences> {
  const row = await database.query.noticePreferences.findFirst({ where: eq(noticePreferences.userId, userId) });
  return { resultReminders: row?.resultReminders ?? true, enrollmentAnswers: row?.enrollmentAnswers ?? true };
}

export async function saveNoticePreferences(database: Database, userId: number, preferences: NoticePreferences) {
  await database.insert(noticePreferences).values({ userId, ...preferences }).onConflictDoUpdate({ target: noticePreferences.userId, set: preferences });
}
