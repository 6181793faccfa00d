/**
 * Who stands behind the study's lab codes: the names a reviewer must never
 * read (labs, their contacts and members, the operators on their results, and
 * their e-mail addresses), for the matcher in `~/lib/blinding`.
 */
import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cells, enrollments, labMembers, labs, results, users } from "~/db/schema";
import type { Identity } from "~/lib/blinding";

export async function studyIdentities(studyId: number): Promise<Identity[]> {
  const [labRows, memberRows, operatorRows] = await Promise.all([
    db
      .select({ name: labs.name, contactName: labs.contactName, contactEmail: labs.contactEmail })
      .from(enrollments)
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(eq(enrollments.studyId, studyId)),
    db
      .select({ name: users.name, email: users.email })
      .from(enrollments)
      .innerJoin(labMembers, eq(labMembers.labId, enrollments.labId))
      .innerJoin(users, eq(users.id, labMembers.userId))
      .where(eq(enrollments.studyId, studyId)),
    db
      .selectDistinct({ operator: results.operator })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(eq(enrollments.studyId, studyId)),
  ]);
  const identities: Identity[] = [
    ...labRows.map((l) => ({ kind: "lab" as const, text: l.name })),
    ...labRows.flatMap((l) => [
      { kind: "person" as const, text: l.contactName },
      { kind: "email" as const, text: l.contactEmail },
    ]),
    ...memberRows.flatMap((m) => [
      { kind: "person" as const, text: m.name },
      { kind: "email" as const, text: m.email },
    ]),
    ...operatorRows.map((o) => ({ kind: "person" as const, text: o.operator })),
  ];
  return identities.filter((identity) => identity.text.trim() !== "");
}
