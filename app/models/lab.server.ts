import { and, asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { labMembers, labs, users } from "~/db/schema";
import { AccountError } from "~/models/user.server";

export type LabInput = Pick<typeof labs.$inferInsert, "name" | "address" | "contactName" | "contactEmail" | "accreditationNumber">;

export async function listLabs() {
  return db.select().from(labs).orderBy(asc(labs.name));
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
