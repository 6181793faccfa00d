/**
 * What a study looks like from outside, shaped by who asks: coordinators and
 * admins see lab names; reviewers see lab codes only, never names or operators;
 * an analyst sees only their own lab.
 */
import { asc, eq, inArray } from "drizzle-orm";
import Papa from "papaparse";
import { db } from "~/db/client.server";
import { enrollments, labs, materials, mixtureConstituents, responses, type Study } from "~/db/schema";
import type { StudyAccess } from "~/server/guards.server";
import { studyResultRows } from "~/models/analysis.server";

type Enrollment = typeof enrollments.$inferSelect;

const seesLabNames = (access: StudyAccess) => access === "admin" || access === "coordinator";

export async function studyDescription(study: Study, access: StudyAccess, ownEnrollment: Enrollment | null) {
  const [studyResponses, studyMaterials, studyLabs] = await Promise.all([
    db.select().from(responses).where(eq(responses.studyId, study.id)).orderBy(asc(responses.sortOrder)),
    db.select().from(materials).where(eq(materials.studyId, study.id)).orderBy(asc(materials.sortOrder)),
    db
      .select({ id: enrollments.id, code: enrollments.labCode, state: enrollments.state, name: labs.name })
      .from(enrollments)
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(eq(enrollments.studyId, study.id))
      .orderBy(asc(enrollments.labCode)),
  ]);
  const constituents = studyMaterials.length
    ? await db.select().from(mixtureConstituents).where(inArray(mixtureConstituents.materialId, studyMaterials.map((m) => m.id))).orderBy(asc(mixtureConstituents.sortOrder))
    : [];
  const visibleLabs =
    access === "analyst"
      ? studyLabs.filter((l) => l.id === ownEnrollment?.id).map((l) => ({ enrollmentId: l.id, code: l.code, name: l.name, state: l.state }))
      : studyLabs.map((l) => (seesLabNames(access) ? { enrollmentId: l.id, code: l.code, name: l.name, state: l.state } : { code: l.code, state: l.state }));
  return {
    study: {
      id: study.id,
      code: study.code,
      title: study.title,
      testMethod: study.testMethod,
      state: study.state,
      replicatesPerCell: study.replicatesPerCell,
      significanceLevel: study.significanceLevel,
      targetSurfaceRating: study.targetSurfaceRating,
      enrollmentDeadline: study.enrollmentDeadline,
      shipDate: study.shipDate,
      resultsDue: study.resultsDue,
    },
    responses: studyResponses.map(({ key, name, unit, kind, decimals }) => ({ key, name, unit, kind, decimals })),
    materials: studyMaterials.map((m) => ({
      code: m.code,
      description: m.description,
      constituents: constituents
        .filter((c) => c.materialId === m.id)
        .map(({ id: _id, materialId: _materialId, sortOrder: _sortOrder, ...rest }) => rest),
    })),
    labs: visibleLabs,
  };
}

/** Results in long form for coordinators (all, with names and status) or reviewers (submitted, by code only). */
export async function exportedResults(studyId: number, access: StudyAccess) {
  const named = seesLabNames(access);
  const rows = await studyResultRows(studyId, { submittedOnly: !named });
  return rows.map((r) =>
    named
      ? { lab: r.labCode, labName: r.labName, material: r.material, response: r.response, replicate: r.replicate, value: r.value, testedOn: r.testedOn, operator: r.operator, status: r.status, amended: r.amended }
      : { lab: r.labCode, material: r.material, response: r.response, replicate: r.replicate, value: r.value, testedOn: r.testedOn },
  );
}

/**
 * CSV of those rows. Text cells that start with =, +, - or @ get a leading
 * apostrophe so a spreadsheet shows them instead of running them.
 */
export function resultsCsv(rows: Record<string, unknown>[]) {
  return Papa.unparse(rows, { escapeFormulae: true, newline: "\r\n" });
}
