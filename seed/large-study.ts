/**
 * A large invented study for the benchmark: 40 labs × 12 materials × 2
 * responses × 5 replicates, all submitted, owned by the demo coordinator, its
 * figures open to the demo's three reviewers. Written in bulk (one insert per
 * table) so it takes seconds, not minutes.
 *
 * Beside it, `seedDeadlineDay` sets up a study on its last day of testing for
 * the load run: the same 40 labs, each with an analyst of its own, and four
 * more coordinators besides the demo's, all signing in with the demo password.
 */
import { eq, inArray } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { todayIso } from "~/lib/format";
import { hashPassword } from "~/models/user.server";
import { cells, enrollments, labMembers, labs, materials, responses, results, studies, studyCoordinators, studyReviewers, users } from "~/db/schema";
import { DEMO_PASSWORD, DEMO_PEOPLE, FLOAT_FINISHING_RESPONSES } from "./demo-data";

export const LARGE_STUDY = { code: "BENCH-40", labs: 40, materials: 12, replicates: 5 };

export async function seedLargeStudy(db: Database) {
  const existing = await db.query.studies.findFirst({ where: eq(studies.code, LARGE_STUDY.code) });
  if (existing) return existing;
  const coordinator = await db.query.users.findFirst({ where: eq(users.email, DEMO_PEOPLE.coordinator.email) });
  if (!coordinator) throw new Error("Seed the demo first: the large study belongs to the demo coordinator.");
  let state = 12345;
  const uniform = () => ((state = (state * 1103515245 + 12345) % 2147483648) / 2147483648);
  return db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({ code: LARGE_STUDY.code, title: "Benchmark study (generated)", testMethod: "Float finishing test of fresh concrete", state: "checking", replicatesPerCell: LARGE_STUDY.replicates, ownerId: coordinator.id, dataVersion: 1 })
      .returning();
    const responseRows = await tx.insert(responses).values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId: study!.id, sortOrder: i }))).returning();
    const materialRows = await tx
      .insert(materials)
      .values(Array.from({ length: LARGE_STUDY.materials }, (_, i) => ({ studyId: study!.id, code: `B${String(i + 1).padStart(2, "0")}`, description: `Generated mixture ${i + 1}`, sortOrder: i })))
      .returning();
    const labRows = await tx
      .insert(labs)
      .values(Array.from({ length: LARGE_STUDY.labs }, (_, i) => ({ name: `Benchmark Lab ${String(i + 1).padStart(2, "0")}` })))
      .returning();
    const enrollmentRows = await tx
      .insert(enrollments)
      .values(labRows.map((lab, i) => ({ studyId: study!.id, labId: lab.id, labCode: `L${String(i + 1).padStart(2, "0")}`, state: "accepted" as const })))
      .returning();
    const cellValues = enrollmentRows.flatMap((e) =>
      materialRows.flatMap((m) => responseRows.map((r) => ({ enrollmentId: e.id, materialId: m.id, responseId: r.id, status: "submitted" as const, submittedAt: new Date() }))),
    );
    const cellRows = await tx.insert(cells).values(cellValues).returning();
    const resultValues = cellRows.flatMap((cell) => {
      const level = 6 + (cell.materialId % 12) + (cell.responseId % 2) * 6;
      const bias = Math.round(2 * (uniform() - 0.5));
      return Array.from({ length: LARGE_STUDY.replicates }, (_, k) => ({ cellId: cell.id, replicate: k + 1, value: Math.max(1, level + bias + Math.round(2 * (uniform() - 0.5))) }));
    });
    // SQLite limits bound parameters per statement; insert in slices.
    for (let i = 0; i < resultValues.length; i += 1000) await tx.insert(results).values(resultValues.slice(i, i + 1000));
    const reviewers = await tx.select({ id: users.id }).from(users).where(inArray(users.email, DEMO_PEOPLE.reviewers.map((r) => r.email)));
    if (reviewers.length) await tx.insert(studyReviewers).values(reviewers.map((r) => ({ studyId: study!.id, userId: r.id })));
    return study!;
  });
}

export const DEADLINE_STUDY = { code: "BENCH-40-LIVE", materials: 12, replicates: 5, extraCoordinators: 4 };
export const deadlineAnalystEmail = (lab: number) => `bench-analyst${String(lab + 1).padStart(2, "0")}@ringbatch.example`;
export const deadlineCoordinatorEmail = (n: number) => `bench-coordinator${n + 1}@ringbatch.example`;

/** The deadline-day study (see above); needs `seedLargeStudy` first for its labs. Returns the study and its materials. */
export async function seedDeadlineDay(db: Database) {
  const existing = await db.query.studies.findFirst({ where: eq(studies.code, DEADLINE_STUDY.code) });
  const materialsOf = (studyId: number) => db.select({ id: materials.id, code: materials.code }).from(materials).where(eq(materials.studyId, studyId)).orderBy(materials.sortOrder);
  if (existing) return { study: existing, materials: await materialsOf(existing.id) };
  const owner = await db.query.users.findFirst({ where: eq(users.email, DEMO_PEOPLE.coordinator.email) });
  const labRows = await db.select({ id: labs.id }).from(labs).where(inArray(labs.name, Array.from({ length: LARGE_STUDY.labs }, (_, i) => `Benchmark Lab ${String(i + 1).padStart(2, "0")}`))).orderBy(labs.name);
  if (!owner || labRows.length !== LARGE_STUDY.labs) throw new Error("Seed the demo and the large study first.");
  // One hash for all: hashing is deliberately slow, and these accounts share the demo password anyway.
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const study = await db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({ code: DEADLINE_STUDY.code, title: "Deadline-day study (generated)", testMethod: "Float finishing test of fresh concrete", state: "testing", replicatesPerCell: DEADLINE_STUDY.replicates, resultsDue: todayIso(), ownerId: owner.id, dataVersion: 1 })
      .returning();
    await tx.insert(responses).values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId: study!.id, sortOrder: i })));
    await tx.insert(materials).values(Array.from({ length: DEADLINE_STUDY.materials }, (_, i) => ({ studyId: study!.id, code: `D${String(i + 1).padStart(2, "0")}`, description: `Generated mixture ${i + 1}`, sortOrder: i })));
    await tx.insert(enrollments).values(labRows.map((lab, i) => ({ studyId: study!.id, labId: lab.id, labCode: `L${String(i + 1).padStart(2, "0")}`, state: "accepted" as const })));
    const analysts = await tx
      .insert(users)
      .values(labRows.map((_, i) => ({ email: deadlineAnalystEmail(i), name: `Benchmark Analyst ${i + 1}`, role: "analyst" as const, passwordHash })))
      .returning({ id: users.id });
    await tx.insert(labMembers).values(labRows.map((lab, i) => ({ labId: lab.id, userId: analysts[i]!.id, isContact: true })));
    const coordinators = await tx
      .insert(users)
      .values(Array.from({ length: DEADLINE_STUDY.extraCoordinators }, (_, i) => ({ email: deadlineCoordinatorEmail(i), name: `Benchmark Coordinator ${i + 1}`, role: "coordinator" as const, passwordHash })))
      .returning({ id: users.id });
    await tx.insert(studyCoordinators).values(coordinators.map((c) => ({ studyId: study!.id, userId: c.id })));
    return study!;
  });
  return { study, materials: await materialsOf(study.id) };
}
