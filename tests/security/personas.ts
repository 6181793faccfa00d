/**
 * The people the access tests speak for, on top of the demo: besides the
 * demo's own accounts, a coordinator, a reviewer and a lab that belong to a
 * third study only, so "someone else's" is a real person with real access.
 */
import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { enrollments, labMembers, labs, studies, studyReviewers, users } from "~/db/schema";
import { hashPassword } from "~/models/user.server";
import { seedDemo } from "../../seed/seed";
import { sessionCookieFor } from "../support/routes";

export const PERSONAS = [
  "anonymous",
  "admin",
  "coordinator",
  "otherCoordinator",
  "analyst",
  "otherAnalyst",
  "reviewer",
  "otherReviewer",
] as const;
export type Persona = (typeof PERSONAS)[number];

export async function seedPersonas() {
  await seedDemo(db);
  const passwordHash = await hashPassword("persona-password");
  const [otherCoordinator] = await db.insert(users).values({ email: "other-coordinator@ringbatch.example", name: "Other Coordinator", role: "coordinator", passwordHash }).returning();
  const [otherReviewer] = await db.insert(users).values({ email: "other-reviewer@ringbatch.example", name: "Other Reviewer", role: "reviewer", passwordHash }).returning();
  const [otherAnalyst] = await db.insert(users).values({ email: "other-analyst@ringbatch.example", name: "Other Analyst", role: "analyst", passwordHash }).returning();
  const [otherLab] = await db.insert(labs).values({ name: "Outside Study Lab" }).returning();
  await db.insert(labMembers).values({ labId: otherLab!.id, userId: otherAnalyst!.id, isContact: true });
  const [otherStudy] = await db
    .insert(studies)
    .values({ code: "OTHER-1", title: "Another coordinator's study", testMethod: "Slump of fresh concrete", replicatesPerCell: 2, ownerId: otherCoordinator!.id })
    .returning();
  await db.insert(studyReviewers).values({ studyId: otherStudy!.id, userId: otherReviewer!.id });
  await db.insert(enrollments).values({ studyId: otherStudy!.id, labId: otherLab!.id, labCode: "L01", state: "accepted" });

  const idOf = async (email: string) => (await db.query.users.findFirst({ where: eq(users.email, email) }))!.id;
  const userIds: Record<Persona, number | null> = {
    anonymous: null,
    admin: await idOf("admin@ringbatch.example"),
    coordinator: await idOf("coordinator@ringbatch.example"),
    otherCoordinator: otherCoordinator!.id,
    analyst: await idOf("analyst1@ringbatch.example"),
    otherAnalyst: otherAnalyst!.id,
    reviewer: await idOf("reviewer1@ringbatch.example"),
    otherReviewer: otherReviewer!.id,
  };
  /** A new signed-in session for each request, since some routes (sign-out) end the one they get. */
  const cookieFor = async (persona: Persona) => (userIds[persona] ? sessionCookieFor(userIds[persona]!) : undefined);
  return { cookieFor, otherStudyId: otherStudy!.id };
}
