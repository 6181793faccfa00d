import { and, asc, eq, inArray, isNull, ne, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { enrollments, labMembers, labs, studies, users } from "~/db/schema";
import { AccountError } from "~/models/user.server";
import { recordAudit } from "~/server/audit.server";

export type LabInput = Pick<typeof labs.$inferInsert, "name" | "address" | "contactName" | "contactEmail" | "accreditationNumber">;

/** The directory that pickers offer: no lab still waiting on its invitation, no lab merged into another. */
export async function listLabs() {
  return db
    .select()
    .from(labs)
    .where(and(isNull(labs.mergedIntoId), or(isNull(labs.listing), ne(labs.listing, "invited"))))
    .orderBy(asc(labs.name));
}

export async function createLab(input: LabInput) {
  const existing = await db.query.labs.findFirst({ where: eq(labs.name, input.name) });
  if (existing) throw new AccountError("name", "A lab with this name already exists.");
  const [lab] = await db.insert(labs).values(input).returning();
  return lab!;
}

/** Changes a lab's directory entry; the name stays unique. */
export async function updateLab(labId: number, input: LabInput) {
  if (!(await db.query.labs.findFirst({ where: eq(labs.id, labId) }))) throw new AccountError("form", "That lab no longer exists.");
  const sameName = await db.query.labs.findFirst({ where: eq(labs.name, input.name) });
  if (sameName && sameName.id !== labId) throw new AccountError("name", "A lab with this name already exists.");
  const [lab] = await db.update(labs).set(input).where(eq(labs.id, labId)).returning();
  return lab!;
}

export async function listColleagues(labId: number) {
  return db
    .select({ id: users.id, name: users.name, email: users.email, isContact: labMembers.isContact, disabledAt: users.disabledAt })
    .from(labMembers)
    .innerJoin(users, eq(users.id, labMembers.userId))
    .where(eq(labMembers.labId, labId))
    .orderBy(asc(users.name));
}

/** Removes a colleague from the lab (the contact cannot remove themselves or another contact). */
export async function removeColleague(labId: number, userId: number, byUserId: number) {
  const membership = await db.query.labMembers.findFirst({
    where: and(eq(labMembers.labId, labId), eq(labMembers.userId, userId)),
  });
  if (!membership) throw new AccountError("form", "That person is not a member of your lab.");
  if (membership.isContact || userId === byUserId) {
    throw new AccountError("form", "A lab contact cannot be removed here; ask an administrator.");
  }
  await db.delete(labMembers).where(and(eq(labMembers.labId, labId), eq(labMembers.userId, userId)));
}

/**
 * The administrator's view of the directory: every listed lab, those a
 * coordinator's invitation added marked for a duplicate check, with what a
 * merge would move.
 */
export async function listLabsForAdmin() {
  const [listed, enrolled, members] = await Promise.all([
    db.select().from(labs).where(and(isNull(labs.mergedIntoId), or(isNull(labs.listing), ne(labs.listing, "invited")))).orderBy(asc(labs.name)),
    db.select({ labId: enrollments.labId, studyCode: studies.code }).from(enrollments).innerJoin(studies, eq(studies.id, enrollments.studyId)).orderBy(asc(studies.code)),
    db.select({ labId: labMembers.labId, email: users.email }).from(labMembers).innerJoin(users, eq(users.id, labMembers.userId)).orderBy(asc(users.email)),
  ]);
  return listed.map((lab) => ({
    ...lab,
    studyCodes: enrolled.filter((e) => e.labId === lab.id).map((e) => e.studyCode),
    memberEmails: members.filter((m) => m.labId === lab.id).map((m) => m.email),
  }));
}

/** An administrator has checked a lab added by an invitation and found no duplicate. */
export async function markLabChecked(labId: number, actorUserId: number) {
  await db.transaction(async (tx) => {
    const [lab] = await tx.update(labs).set({ listing: null }).where(and(eq(labs.id, labId), eq(labs.listing, "unchecked"))).returning();
    if (!lab) throw new AccountError("form", "That lab is not waiting for a check.");
    await recordAudit({ actorUserId, action: "lab_checked", entityType: "lab", entityId: labId }, tx);
  });
}

/**
 * Merges a duplicate into a lab of the directory: its enrollments (and with
 * them every batch, result, query and decision), and its people move
 * to the other lab (published proficiency scores never change: the lab's
 * history reads them through `merged_into_id`), and the duplicate leaves the
 * directory and every picker. Its row stays, pointing at the lab it became,
 * so the audit trail's old entries still name something. Refused when both
 * labs take part in one study, which would give that study the same lab twice.
 */
export async function mergeLab(labId: number, intoLabId: number, actorUserId: number) {
  if (labId === intoLabId) throw new AccountError("intoLabId", "Choose another lab: a lab cannot be merged into itself.");
  return db.transaction(async (tx) => {
    const [from, into] = await Promise.all([
      tx.query.labs.findFirst({ where: and(eq(labs.id, labId), isNull(labs.mergedIntoId)) }),
      tx.query.labs.findFirst({ where: and(eq(labs.id, intoLabId), isNull(labs.mergedIntoId)) }),
    ]);
    if (!from) throw new AccountError("form", "That lab no longer exists or was merged already.");
    if (!into || into.listing === "invited") throw new AccountError("intoLabId", "Choose a lab of the directory.");
    const fromEnrollments = await tx.select({ id: enrollments.id, studyId: enrollments.studyId }).from(enrollments).where(eq(enrollments.labId, labId));
    const shared = fromEnrollments.length
      ? await tx
          .select({ code: studies.code })
          .from(enrollments)
          .innerJoin(studies, eq(studies.id, enrollments.studyId))
          .where(and(eq(enrollments.labId, intoLabId), inArray(enrollments.studyId, fromEnrollments.map((e) => e.studyId))))
      : [];
    if (shared.length) {
      throw new AccountError("intoLabId", `Both labs take part in ${shared.map((s) => s.code).join(", ")}: a study cannot have the same lab twice, so they cannot be merged.`);
    }
    const people = await tx.select().from(labMembers).where(eq(labMembers.labId, labId));
    await tx.update(enrollments).set({ labId: intoLabId }).where(eq(enrollments.labId, labId));
    if (people.length) await tx.insert(labMembers).values(people.map((p) => ({ ...p, labId: intoLabId }))).onConflictDoNothing();
    await tx.delete(labMembers).where(eq(labMembers.labId, labId));
    // The merged lab's name is freed for the directory; the audit entry keeps the name it had.
    await tx.update(labs).set({ mergedIntoId: intoLabId, listing: null, name: `${from.name} (merged into #${intoLabId}, was #${labId})` }).where(eq(labs.id, labId));
    await recordAudit(
      {
        actorUserId,
        action: "lab_merged",
        entityType: "lab",
        entityId: labId,
        before: { name: from.name, contactEmail: from.contactEmail },
        after: { mergedInto: intoLabId, name: into.name, enrollments: fromEnrollments.map((e) => e.id), people: people.map((p) => p.userId) },
      },
      tx,
    );
    return { from, into, enrollments: fromEnrollments.length, people: people.length };
  });
}
