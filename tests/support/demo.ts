import { and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { enrollments, labs, materials, studies, users } from "~/db/schema";
import { DEMO_LABS } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "./database";
import { sessionCookieFor } from "./routes";

/** A signed-in cookie for one of the seeded demo accounts. */
export async function demoCookie(email: string) {
  const user = await db.query.users.findFirst({ where: eq(users.email, email) });
  if (!user) throw new Error(`No demo account ${email}`);
  return sessionCookieFor(user.id);
}

/** A new database holding the demo data, as `npm run db:seed` leaves it. */
export async function useDemoDatabase() {
  await useFreshDatabase();
  await seedDemo(db);
}

/** One of the seeded studies, by its code. */
export async function demoStudy(code: string) {
  const study = await db.query.studies.findFirst({ where: eq(studies.code, code) });
  if (!study) throw new Error(`No demo study ${code}`);
  return study;
}

/** The ids of a study's materials (as route params), by material code. */
export async function materialIdsByCode(studyId: number) {
  const rows = await db.select({ id: materials.id, code: materials.code }).from(materials).where(eq(materials.studyId, studyId));
  return Object.fromEntries(rows.map((m) => [m.code, String(m.id)]));
}

/**
 * The demo database with FF-2026-B, the study in testing, as the lab pages'
 * tests use it: its id and the ids of its materials F1 and F2, as route params.
 */
export async function useDemoStudyInTesting() {
  await useDemoDatabase();
  const study = await demoStudy("FF-2026-B");
  const ids = await materialIdsByCode(study.id);
  return { studyId: String(study.id), f1: ids.F1!, f2: ids.F2! };
}

/** The enrollment in a study of the demo lab `DEMO_LABS[labIndex]`. */
export async function demoEnrollment(studyId: number, labIndex: number) {
  const lab = await db.query.labs.findFirst({ where: eq(labs.name, DEMO_LABS[labIndex]!.name) });
  const enrollment = lab && (await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, studyId), eq(enrollments.labId, lab.id)) }));
  if (!enrollment) throw new Error(`Demo lab ${labIndex} is not enrolled in study ${studyId}`);
  return enrollment;
}
