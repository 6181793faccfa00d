/**
 * Inviting labs to a study. The token (32 random bytes, base64url) exists only
 * in the e-mail; the database keeps its SHA-256. A token works once and for 14
 * days, and only for the study its link names.
 */
import { randomBytes } from "node:crypto";
import { and, asc, count, desc, eq, gt, isNull, ne, or, sql } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { enrollments, invitations, labMembers, labs, materials, responses, studies, studyReviewers, userRoles, users, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, sendEmail } from "~/server/email.server";
import { invitationEmail } from "~/server/email-templates.server";
import { FieldRefusal } from "~/lib/field-refusal";
import { drawLabCode } from "~/server/lab-codes.server";
import { writeRefusal } from "~/lib/write-rules";
import { bumpDataVersion } from "~/models/analysis.server";
import type { SessionUser } from "~/models/user.server";
import { hashPassword, normaliseEmail } from "~/models/user.server";
import { formatDate } from "~/lib/format";
import { hashToken } from "~/server/token-hash.server";

export const INVITATION_LIFETIME_MS = 14 * 24 * 60 * 60 * 1000;


export class InvitationError extends FieldRefusal {}

export function invitationPath(token: string, studyId: number) {
  return `/invite/${token}?study=${studyId}`;
}

/** Invites a lab of the directory: enrollment `invited`, a fresh token, an e-mail to the lab's contact. */
export async function inviteLab(study: Study, labId: number, actorUserId: number, request: Request | null) {
  assertInvitationsOpen(study, "labId");
  const lab = await db.query.labs.findFirst({ where: and(eq(labs.id, labId), isNull(labs.mergedIntoId)) });
  if (!lab) throw new InvitationError("labId", "Choose a lab from the directory.");
  if (!lab.contactEmail) throw new InvitationError("labId", "This lab has no contact e-mail; ask an administrator to add one.");
  await refuseReviewersLab(study, lab.id, lab.contactEmail, "labId");
  const token = await db.transaction((tx) => issueInvitation(tx, study, lab, actorUserId));
  await sendInvitationEmail(study, lab, token, request);
  return { token };
}

/**
 * Invites a lab that is not in the directory, by its name and its contact's
 * e-mail. The lab is kept out of the directory until its contact accepts;
 * then it joins it, marked for an administrator's duplicate check.
 */
export async function inviteOutsideLab(study: Study, input: { labName: string; contactName: string; contactEmail: string }, actorUserId: number, request: Request | null) {
  assertInvitationsOpen(study, "labName");
  const contactEmail = normaliseEmail(input.contactEmail);
  const [sameName] = await db.select().from(labs).where(sql`lower(${labs.name}) = ${input.labName.toLowerCase()}`);
  const sameContact = await db.query.labs.findFirst({ where: and(sql`lower(${labs.contactEmail}) = ${contactEmail}`, isNull(labs.mergedIntoId), or(isNull(labs.listing), ne(labs.listing, "invited"))) });
  if (sameName && (sameName.listing !== "invited" || normaliseEmail(sameName.contactEmail) !== contactEmail)) {
    throw new InvitationError("labName", sameName.listing === "invited" ? "A lab of this name was invited with another contact and has not joined the directory: check the name and the contact with the lab." : "A lab of this name is in the directory: invite it from the list.");
  }
  if (sameContact) throw new InvitationError("contactEmail", `This is the contact of ${sameContact.name}, which is in the directory: invite it from the list.`);
  await refuseReviewersLab(study, sameName?.id ?? null, contactEmail, "contactEmail");
  const { lab, token } = await db.transaction(async (tx) => {
    // A lab already invited to another study under this name and contact is the same lab, still waiting.
    const lab =
      sameName ??
      (await tx.insert(labs).values({ name: input.labName, contactName: input.contactName, contactEmail, listing: "invited" }).returning())[0]!;
    if (!sameName) await recordAudit({ actorUserId, action: "lab_created", entityType: "lab", entityId: lab.id, studyId: study.id, after: { ...input, listing: "invited" } }, tx);
    return { lab, token: await issueInvitation(tx, study, lab, actorUserId) };
  });
  await sendInvitationEmail(study, lab, token, request);
  return { token, lab };
}

function assertInvitationsOpen(study: Study, field: string) {
  const refusal = writeRefusal("invitations", study.state);
  if (refusal) throw new InvitationError(field, refusal);
}

/** A reviewer never reviews a study in which their own lab takes part, so their lab is not invited to it. */
async function refuseReviewersLab(study: Study, labId: number | null, contactEmail: string, field: string) {
  const reviewers = await db
    .select({ name: users.name, email: users.email, id: users.id })
    .from(studyReviewers)
    .innerJoin(users, eq(users.id, studyReviewers.userId))
    .where(eq(studyReviewers.studyId, study.id));
  if (reviewers.length === 0) return;
  const members = labId ? await db.select({ userId: labMembers.userId }).from(labMembers).where(eq(labMembers.labId, labId)) : [];
  const conflict = reviewers.find((r) => normaliseEmail(r.email) === normaliseEmail(contactEmail) || members.some((m) => m.userId === r.id));
  if (conflict) throw new InvitationError(field, `${conflict.name}, a reviewer of this study, works at this lab: a reviewer's own lab cannot take part in the study they review.`);
}

/** Enrollment `invited` (new or again), earlier links retired, a fresh token; returns the token, which only the e-mail carries. */
async function issueInvitation(tx: Transaction, study: Study, lab: typeof labs.$inferSelect, actorUserId: number) {
  const token = randomBytes(32).toString("base64url");
  const existing = await tx.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, lab.id)) });
  if (existing?.state === "accepted") throw new InvitationError("labId", "This lab has already accepted.");
  const enrollmentId = existing
    ? (await tx.update(enrollments).set({ state: "invited", invitedAt: new Date(), respondedAt: null }).where(eq(enrollments.id, existing.id)).returning())[0]!.id
    : (await tx.insert(enrollments).values({ studyId: study.id, labId: lab.id, state: "invited", invitedAt: new Date() }).returning())[0]!.id;
  // A new invitation retires any earlier link of the same enrollment.
  await tx.update(invitations).set({ expiresAt: new Date() }).where(and(eq(invitations.enrollmentId, enrollmentId), isNull(invitations.usedAt)));
  await tx.insert(invitations).values({ enrollmentId, email: normaliseEmail(lab.contactEmail), tokenHash: hashToken(token), expiresAt: new Date(Date.now() + INVITATION_LIFETIME_MS) });
  await recordAudit({ actorUserId, action: "lab_invited", entityType: "enrollment", entityId: enrollmentId, studyId: study.id, after: { labId: lab.id, email: lab.contactEmail } }, tx);
  return token;
}

/** The invitation e-mail: the study's dates, the workload and whom to ask. */
async function sendInvitationEmail(study: Study, lab: typeof labs.$inferSelect, token: string, request: Request | null) {
  const [owner, [materialCount], studyResponses] = await Promise.all([
    db.query.users.findFirst({ where: eq(users.id, study.ownerId), columns: { name: true, email: true } }),
    db.select({ n: count() }).from(materials).where(eq(materials.studyId, study.id)),
    db.select({ name: responses.name, unit: responses.unit }).from(responses).where(eq(responses.studyId, study.id)).orderBy(asc(responses.sortOrder)),
  ]);
  await sendEmail(
    invitationEmail({
      to: lab.contactEmail,
      contactName: lab.contactName,
      labName: lab.name,
      study,
      workload: { materials: materialCount!.n, replicates: study.replicatesPerCell, responses: studyResponses.map((r) => (r.unit ? `${r.name} (${r.unit})` : r.name)) },
      coordinator: owner!,
      url: appUrl(request, invitationPath(token, study.id)),
      expiresOn: formatDate(new Date(Date.now() + INVITATION_LIFETIME_MS)),
    }),
    { studyId: study.id },
  );
}

export type InvitationLookup =
  | { status: "unknown" | "other_study" }
  | { status: "used" | "expired"; study: Study }
  | {
      status: "valid";
      invitation: typeof invitations.$inferSelect;
      enrollment: typeof enrollments.$inferSelect;
      study: Study;
      lab: typeof labs.$inferSelect;
      account: { id: number; hasPassword: boolean } | null;
    };

/** What a token opens; refusals say why, for a clear page. */
export async function lookupInvitation(token: string, studyIdParam: string | null, now = new Date()): Promise<InvitationLookup> {
  const invitation = await db.query.invitations.findFirst({ where: eq(invitations.tokenHash, hashToken(token)) });
  if (!invitation) return { status: "unknown" };
  const enrollment = (await db.query.enrollments.findFirst({ where: eq(enrollments.id, invitation.enrollmentId) }))!;
  if (String(enrollment.studyId) !== studyIdParam) return { status: "other_study" };
  const study = (await db.query.studies.findFirst({ where: eq(studies.id, enrollment.studyId) }))!;
  if (invitation.usedAt) return { status: "used", study };
  if (invitation.expiresAt.getTime() <= now.getTime()) return { status: "expired", study };
  const lab = (await db.query.labs.findFirst({ where: eq(labs.id, enrollment.labId) }))!;
  const user = await db.query.users.findFirst({ where: eq(users.email, invitation.email) });
  return { status: "valid", invitation, enrollment, study, lab, account: user ? { id: user.id, hasPassword: user.passwordHash !== null } : null };
}

type Valid = Extract<InvitationLookup, { status: "valid" }>;

/** Marks the token used; false when someone used it first (single use even under a race). */
async function claim(tx: Transaction, invitationId: number) {
  const claimed = await tx
    .update(invitations)
    .set({ usedAt: new Date() })
    .where(and(eq(invitations.id, invitationId), isNull(invitations.usedAt)))
    .returning({ id: invitations.id });
  return claimed.length === 1;
}

/**
 * Accepts: the enrollment gets a random blind lab code unique in the study.
 * A new contact's account (analyst, lab contact) is created in the same
 * transaction; an existing one must be the signed-in user, and becomes an
 * analyst of the lab besides what else they are. A lab invited from outside
 * the directory joins it here, marked for an administrator's duplicate check.
 */
export async function acceptInvitation(found: Valid, who: { signedIn: SessionUser } | { name: string; password: string }) {
  const passwordHash = "password" in who ? await hashPassword(who.password) : null;
  if (found.account) await refuseReviewerAccepting(found.study.id, found.account.id);
  return db.transaction(async (tx) => {
    if (!(await claim(tx, found.invitation.id))) throw new InvitationError("form", "This invitation has already been used.");
    let userId: number;
    if ("signedIn" in who) {
      userId = who.signedIn.id;
    } else if (found.account) {
      // An account made without a password (by an administrator) gets its first one here.
      if (found.account.hasPassword) throw new InvitationError("form", "An account with this e-mail exists: sign in to accept.");
      await tx.update(users).set({ name: who.name, passwordHash }).where(eq(users.id, found.account.id));
      userId = found.account.id;
    } else {
      const [created] = await tx.insert(users).values({ email: found.invitation.email, name: who.name, role: "analyst", passwordHash }).returning();
      userId = created!.id;
    }
    await tx.insert(labMembers).values({ labId: found.lab.id, userId, isContact: true }).onConflictDoNothing();
    const account = (await tx.query.users.findFirst({ where: eq(users.id, userId) }))!;
    if (account.role !== "analyst") await tx.insert(userRoles).values({ userId, role: "analyst" }).onConflictDoNothing();
    if (found.lab.listing === "invited") {
      await tx.update(labs).set({ listing: "unchecked" }).where(eq(labs.id, found.lab.id));
      await recordAudit({ actorUserId: userId, action: "lab_joined_directory", entityType: "lab", entityId: found.lab.id, studyId: found.study.id, after: { name: found.lab.name } }, tx);
    }
    const taken = await tx.select({ code: enrollments.labCode }).from(enrollments).where(eq(enrollments.studyId, found.study.id));
    const labCode = drawLabCode(new Set(taken.map((t) => t.code).filter((c): c is string => c !== null)), taken.length);
    await tx.update(enrollments).set({ state: "accepted", labCode, respondedAt: new Date() }).where(eq(enrollments.id, found.enrollment.id));
    await recordAudit(
      { actorUserId: userId, action: "invitation_accepted", entityType: "enrollment", entityId: found.enrollment.id, studyId: found.study.id, after: { labCode } },
      tx,
    );
    return { userId, labCode };
  });
}

async function refuseReviewerAccepting(studyId: number, userId: number) {
  const reviews = await db.query.studyReviewers.findFirst({ where: and(eq(studyReviewers.studyId, studyId), eq(studyReviewers.userId, userId)) });
  if (reviews) throw new InvitationError("form", "You review this study: a reviewer's own lab cannot take part in it. Ask the coordinator to invite another contact of your lab.");
}

export async function declineInvitation(found: Valid, actorUserId: number | null) {
  await db.transaction(async (tx) => {
    if (!(await claim(tx, found.invitation.id))) throw new InvitationError("form", "This invitation has already been used.");
    await tx.update(enrollments).set({ state: "declined", respondedAt: new Date() }).where(eq(enrollments.id, found.enrollment.id));
    await recordAudit({ actorUserId, action: "invitation_declined", entityType: "enrollment", entityId: found.enrollment.id, studyId: found.study.id }, tx);
  });
}

/**
 * A signed-in analyst of the invited lab answers from the lab home, without
 * the e-mail's link: the enrollment's pending invitation is answered as the
 * link would answer it, so it too is used once and only while it is valid.
 */
export async function answerInvitationInApp(user: SessionUser, enrollmentId: number, answer: "accept" | "decline") {
  const enrollment = await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollmentId) });
  if (!enrollment || !user.labIds.includes(enrollment.labId)) throw new InvitationError("form", "Your lab has no invitation to answer here.");
  if (enrollment.state !== "invited") throw new InvitationError("form", "This invitation has already been answered.");
  const invitation = await db.query.invitations.findFirst({
    where: and(eq(invitations.enrollmentId, enrollmentId), isNull(invitations.usedAt), gt(invitations.expiresAt, new Date())),
    orderBy: desc(invitations.id),
  });
  if (!invitation) throw new InvitationError("form", "This invitation has expired. Ask the study coordinator to invite your lab again.");
  const [study, lab] = await Promise.all([
    db.query.studies.findFirst({ where: eq(studies.id, enrollment.studyId) }),
    db.query.labs.findFirst({ where: eq(labs.id, enrollment.labId) }),
  ]);
  const found: Valid = { status: "valid", invitation, enrollment, study: study!, lab: lab!, account: { id: user.id, hasPassword: true } };
  if (answer === "decline") return declineInvitation(found, user.id);
  await acceptInvitation(found, { signedIn: user });
}

/**
 * Withdraws an invited or enrolled lab with the coordinator's reason. Its
 * pending invitation stops working, it can no longer change results, and its
 * results (kept, for the record) leave the analysis: the study's data version
 * moves on in the same transaction.
 */
export async function withdrawEnrollment(study: Study, enrollmentId: number, reason: string, actorUserId: number) {
  const refusal = writeRefusal("withdrawals", study.state);
  if (refusal) throw new InvitationError("reason", refusal);
  await db.transaction(async (tx) => {
    const enrollment = await tx.query.enrollments.findFirst({ where: and(eq(enrollments.id, enrollmentId), eq(enrollments.studyId, study.id)) });
    if (!enrollment) throw new InvitationError("reason", "This lab is not in the study.");
    if (enrollment.state !== "invited" && enrollment.state !== "accepted") throw new InvitationError("reason", "Only an invited or enrolled lab can be withdrawn.");
    await tx.update(enrollments).set({ state: "withdrawn", respondedAt: new Date() }).where(eq(enrollments.id, enrollmentId));
    await tx.update(invitations).set({ expiresAt: new Date() }).where(and(eq(invitations.enrollmentId, enrollmentId), isNull(invitations.usedAt)));
    await bumpDataVersion(tx, study.id);
    await recordAudit(
      { actorUserId, action: "lab_withdrawn", entityType: "enrollment", entityId: enrollmentId, studyId: study.id, before: { state: enrollment.state }, after: { state: "withdrawn" }, reason },
      tx,
    );
  });
}

/** The study's enrollments with their labs, for the coordinator's lab page. */
export async function listStudyEnrollments(studyId: number) {
  return db
    .select({ lab: labs, id: enrollments.id, labId: labs.id, state: enrollments.state, labCode: enrollments.labCode, invitedAt: enrollments.invitedAt })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(labs.name);
}
