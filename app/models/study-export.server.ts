/**
 * What a study looks like from outside, shaped by who asks: coordinators and
 * admins see lab names; reviewers see lab codes only, never names or operators;
 * an analyst sees only their own lab.
 */
import { asc, count, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { amendments, cellDecisions, cells, enrollments, labs, materials, mixtureConstituents, responses, type Study } from "~/db/schema";
import { type ExportColumn, type ExportTable, exportTable } from "~/lib/exports/table";
import type { StudyAnalysis } from "~/lib/precision";
import type { StudyAccess } from "~/server/guards.server";
import { studyAnalysis, type StudyResultRow, studyResultRows } from "~/models/analysis.server";
import { listStatements } from "~/models/statement.server";

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

type ExportedResult = StudyResultRow & { amendments: number; decision: "retained" | "excluded" | null; decisionReason: string | null };

/** The titles of the columns after the lab code; each column's key is the row's field it shows. */
const RESULT_FIELD_TITLES = {
  labName: "Lab",
  material: "Material",
  response: "Response",
  replicate: "Replicate",
  value: "Value",
  testedOn: "Test date",
  operator: "Operator",
  status: "Cell status",
  amendments: "Amendments",
  decision: "Cell decision",
  decisionReason: "Decision reason",
} satisfies Partial<Record<keyof ExportedResult, string>>;

const RESULT_COLUMNS: ExportColumn<ExportedResult>[] = [
  { key: "lab", title: "Lab code", value: (r) => r.labCode },
  ...(Object.entries(RESULT_FIELD_TITLES) as [keyof typeof RESULT_FIELD_TITLES, string][]).map(([key, title]) => ({ key, title, value: (r: ExportedResult) => r[key] })),
];

/**
 * What reviewers see: blinded (codes, never names or operators) and submitted
 * cells only, so status and amendments, which only drafts and the labs'
 * corrections show, stay with the coordinator.
 */
const REVIEWER_COLUMNS = new Set(["lab", "material", "response", "replicate", "value", "testedOn", "decision", "decisionReason"]);

/**
 * The study's results in long form, one row per replicate, with each cell's
 * status, amendment count and decision: for coordinators and admins every
 * result with lab names; for reviewers the submitted ones by lab code only.
 * The results pages, the JSON API and both downloads read this one table.
 */
export async function resultsTable(studyId: number, access: StudyAccess): Promise<ExportTable> {
  const named = seesLabNames(access);
  const [rows, amendmentCounts, decisions] = await Promise.all([
    studyResultRows(studyId, { submittedOnly: !named }),
    db
      .select({ cellId: amendments.cellId, count: count() })
      .from(amendments)
      .innerJoin(cells, eq(cells.id, amendments.cellId))
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(eq(enrollments.studyId, studyId))
      .groupBy(amendments.cellId),
    db
      .select({ cellId: cellDecisions.cellId, decision: cellDecisions.decision, reason: cellDecisions.reason })
      .from(cellDecisions)
      .innerJoin(cells, eq(cells.id, cellDecisions.cellId))
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(eq(enrollments.studyId, studyId)),
  ]);
  const amendmentsOf = new Map(amendmentCounts.map((a) => [a.cellId, a.count]));
  const decisionOf = new Map(decisions.map((d) => [d.cellId, d]));
  const exported = rows.map((r) => ({
    ...r,
    amendments: amendmentsOf.get(r.cellId) ?? 0,
    decision: decisionOf.get(r.cellId)?.decision ?? null,
    decisionReason: decisionOf.get(r.cellId)?.reason ?? null,
  }));
  const columns = named ? RESULT_COLUMNS : RESULT_COLUMNS.filter((c) => REVIEWER_COLUMNS.has(c.key));
  return exportTable("Results", columns, exported);
}

/**
 * The analysis as the caller sees it: coordinators and admins the live
 * figures at the chosen level; reviewers what the review page shows them,
 * the figures frozen in the statement sent to the committee, or the live
 * ones before any was sent.
 */
export async function visibleAnalysis(study: Study, access: StudyAccess, alpha?: number): Promise<StudyAnalysis> {
  if (access === "reviewer") {
    const sent = (await listStatements(study.id)).find((s) => s.sentAt !== null);
    if (sent) return sent.snapshot.analysis;
  }
  return studyAnalysis(study, { alpha });
}
