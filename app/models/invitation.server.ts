/**
 * Inviting labs to a study. The token (32 random bytes, base64url) exists only
 * in the e-mail; the database keeps its SHA-256. A token works once and for 14
 * days, and only for the study its link names.
 */
import { randomBytes } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { enrollments, invitations, labMembers, labs, studies, users, type Study } from "~/db/schema";
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
  const refusal = writeRefusal("invitations", study.state);
  if (refusal) throw new InvitationError("labId", refusal);
  const lab = await db.query.labs.findFirst({ where: eq(labs.id, labId) });
  if (!lab) throw new InvitationError("labId", "Choose a lab from the directory.");
  if (!lab.contactEmail) throw new InvitationError("labId", "This lab has no contact e-mail; ask an administrator to add one.");
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITATION_LIFETIME_MS);
  await db.transaction(async (tx) => {
    const existing = await tx.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, labId)) });
    if (existing?.state === "accepted") throw new InvitationError("labId", "This lab has already accepted.");
    const enrollmentId = existing
      ? (await tx.update(enrollments).set({ state: "invited", invitedAt: new Date(), respondedAt: null }).where(eq(enrollments.id, existing.id)).returning())[0]!.id
      : (await tx.insert(enrollments).values({ studyId: study.id, labId, state: "invited", invitedAt: new Date() }).returning())[0]!.id;
    // A new invitation retires any earlier link of the same enrollment.
    await tx.update(invitations).set({ expiresAt: new Date() }).where(and(eq(invitations.enrollmentId, enrollmentId), isNull(invitations.usedAt)));
    await tx.insert(invitations).values({ enrollmentId, email: normaliseEmail(lab.contactEmail), tokenHash: hashToken(token), expiresAt });
    await recordAudit({ actorUserId, action: "lab_invited", entityType: "enrollment", entityId: enrollmentId, studyId: study.id, after: { labId, email: lab.contactEmail } }, tx);
  });
  await sendEmail(
    invitationEmail({
      to: lab.contactEmail,
      contactName: lab.contactName,
      labName: lab.name,
      study,
      url: appUrl(request, invitationPath(token, study.id)),
      expiresOn: formatDate(expiresAt),
    }),
    { studyId: study.id },
  );
  return { token };
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
 * transaction; an existing one must be the signed-in user.
 */
export async function acceptInvitation(found: Valid, who: { signedIn: SessionUser } | { name: string; password: string }) {
  const passwordHash = "password" in who ? await hashPassword(who.password) : null;
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

export async function declineInvitation(found: Valid, actorUserId: number | null) {
  await db.transaction(async (tx) => {
    if (!(await claim(tx, found.invitation.id))) throw new InvitationError("form", "This invitation has already been used.");
    await tx.update(enrollments).set({ state: "declined", respondedAt: new Date() }).where(eq(enrollments.id, found.enrollment.id));
    await recordAudit({ actorUserId, action: "invitation_declined", entityType: "enrollment", entityId: found.enrollment.id, studyId: found.study.id }, tx);
  });
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
    .select({
      id: enrollments.id,
      labId: labs.id,
      labName: labs.name,
      contactName: labs.contactName,
      contactEmail: labs.contactEmail,
      accreditationNumber: labs.accreditationNumber,
      address: labs.address,
      state: enrollments.state,
      labCode: enrollments.labCode,
      invitedAt: enrollments.invitedAt,
      respondedAt: enrollments.respondedAt,
    })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(labs.name);
}
