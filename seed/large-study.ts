/**
 * A large invented study for the benchmark: 40 labs × 12 materials × 2
 * responses × 5 replicates, all submitted, owned by the demo coordinator.
 * Written in bulk (one insert per table) so it takes seconds, not minutes.
 */
import { eq } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { cells, enrollments, labs, materials, responses, results, studies, users } from "~/db/schema";
import { DEMO_PEOPLE, FLOAT_FINISHING_RESPONSES } from "./demo-data";

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
    return study!;
  });
}
