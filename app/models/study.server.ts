import { and, asc, count, desc, eq, inArray, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cells, enrollments, labs, materials, queries, responses, studies, studyCoordinators, studyReviewers, type Study, type StudyKind } from "~/db/schema";
import { CELL_STATUS_ORDER, type CellStatus, cellStatusOf } from "~/lib/cell-status";
import type { SessionUser } from "~/models/user.server";
import { readPage } from "~/lib/paging";


function coordinatedBy(user: SessionUser, kind: StudyKind | "any") {
  const coordinated = db.select({ id: studyCoordinators.studyId }).from(studyCoordinators).where(eq(studyCoordinators.userId, user.id));
  return and(
    kind === "any" ? undefined : eq(studies.kind, kind),
    user.roles.includes("admin") ? undefined : or(eq(studies.ownerId, user.id), inArray(studies.id, coordinated)),
  );
}

/**
 * Studies of one kind that the user coordinates (every one for an admin).
 * Rounds and ruggedness studies have lists of their own; account pages ask for every kind.
 */
export async function listCoordinatedStudies(user: SessionUser, kind: StudyKind | "any" = "precision") {
  return db.select().from(studies).where(coordinatedBy(user, kind)).orderBy(asc(studies.code));
}

/** One page of the precision studies the user coordinates, newest first. */
export async function coordinatedStudiesPage(user: SessionUser, page: number) {
  const where = coordinatedBy(user, "precision");
  return readPage(
    page,
    async () => (await db.select({ total: count() }).from(studies).where(where))[0]!.total,
    (limit, offset) => db.select().from(studies).where(where).orderBy(desc(studies.createdAt), desc(studies.id)).limit(limit).offset(offset),
  );
}

export async function listReviewedStudies(userId: number) {
  return db
    .select({ id: studies.id, code: studies.code, title: studies.title, state: studies.state })
    .from(studyReviewers)
    .innerJoin(studies, eq(studies.id, studyReviewers.studyId))
    .where(eq(studyReviewers.userId, userId))
    .orderBy(asc(studies.code));
}

const labEnrollmentColumns = {
  enrollmentId: enrollments.id,
  enrollmentState: enrollments.state,
  labCode: enrollments.labCode,
  labName: labs.name,
  studyId: studies.id,
  studyCode: studies.code,
  studyTitle: studies.title,
  studyState: studies.state,
  resultsDue: studies.resultsDue,
};

/** The enrollments of the user's labs, with the study each belongs to. Only their own lab. */
export async function listLabEnrollments(labIds: number[]) {
  if (labIds.length === 0) return [];
  return db
    .select(labEnrollmentColumns)
    .from(enrollments)
    .innerJoin(studies, eq(studies.id, enrollments.studyId))
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(inArray(enrollments.labId, labIds))
    .orderBy(asc(studies.code));
}

/** One page of the user's labs' enrollments, newest study first. */
export async function labEnrollmentsPage(labIds: number[], page: number) {
  const where = inArray(enrollments.labId, labIds);
  return readPage(
    page,
    async () => (labIds.length ? (await db.select({ total: count() }).from(enrollments).where(where))[0]!.total : 0),
    (limit, offset) =>
      db
        .select(labEnrollmentColumns)
        .from(enrollments)
        .innerJoin(studies, eq(studies.id, enrollments.studyId))
        .innerJoin(labs, eq(labs.id, enrollments.labId))
        .where(where)
        .orderBy(desc(studies.createdAt), desc(studies.id), asc(labs.name))
        .limit(limit)
        .offset(offset),
  );
}

/** Submitted cell counts of the given enrollments (one query), for their own lab's to-do list. */
export async function submittedCellCounts(enrollmentIds: number[]) {
  if (enrollmentIds.length === 0) return new Map<number, number>();
  const rows = await db
    .select({ enrollmentId: cells.enrollmentId, cells: count() })
    .from(cells)
    .where(and(inArray(cells.enrollmentId, enrollmentIds), eq(cells.status, "submitted")))
    .groupBy(cells.enrollmentId);
  return new Map(rows.map((r) => [r.enrollmentId, r.cells]));
}

export { CELL_STATUS_ORDER, type CellStatus };

/**
 * Lab × material matrix of cell status for the coordinator's overview (one
 * query per table, no per-row queries). A lab × material pair is `queried`
 * while any of its cells has a query not yet closed. Pass `enrollmentId` to
 * read one lab's own row only.
 */
export async function studyMatrix(studyId: number, { enrollmentId }: { enrollmentId?: number } = {}) {
  const enrollmentScope = enrollmentId === undefined ? eq(enrollments.studyId, studyId) : and(eq(enrollments.studyId, studyId), eq(enrollments.id, enrollmentId));
  const [studyMaterials, studyResponses, studyEnrollments, studyCells, openQueries] = await Promise.all([
    db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder), asc(materials.code)),
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
    db
      .select({ id: enrollments.id, labCode: enrollments.labCode, state: enrollments.state, labName: labs.name })
      .from(enrollments)
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(and(enrollmentScope, eq(enrollments.state, "accepted")))
      .orderBy(asc(enrollments.labCode)),
    db
      .select({ enrollmentId: cells.enrollmentId, materialId: cells.materialId, status: cells.status, amended: cells.amended })
      .from(cells)
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(enrollmentScope),
    db
      .selectDistinct({ enrollmentId: cells.enrollmentId, materialId: cells.materialId })
      .from(queries)
      .innerJoin(cells, eq(cells.id, queries.cellId))
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(and(enrollmentScope, inArray(queries.state, ["open", "answered"]))),
  ]);
  const statusByKey = new Map<string, CellStatus[]>();
  for (const c of studyCells) {
    const key = `${c.enrollmentId}:${c.materialId}`;
    const status = cellStatusOf(c);
    statusByKey.set(key, [...(statusByKey.get(key) ?? []), status]);
  }
  const queried = new Set(openQueries.map((q) => `${q.enrollmentId}:${q.materialId}`));
  const resultStatus = (enrollmentId: number, materialId: number): CellStatus => {
    const statuses = statusByKey.get(`${enrollmentId}:${materialId}`) ?? [];
    if (statuses.length < studyResponses.length || statuses.length === 0) return statuses.length ? "draft" : "not_started";
    if (statuses.every((s) => s === "submitted" || s === "amended")) return statuses.includes("amended") ? "amended" : "submitted";
    return "draft";
  };
  return {
    materials: studyMaterials,
    responses: studyResponses,
    rows: studyEnrollments.map((e) => {
      const results = studyMaterials.map((m) => resultStatus(e.id, m.id));
      return {
        ...e,
        statuses: results.map((status, i): CellStatus => (queried.has(`${e.id}:${studyMaterials[i]!.id}`) ? "queried" : status)),
        /** Whether every cell of the pair is submitted, whatever queries are open. */
        submitted: results.map((status) => status === "submitted" || status === "amended"),
      };
    }),
  };
}

export type StudyMatrix = Awaited<ReturnType<typeof studyMatrix>>;

/** How many lab × material pairs are in each status, per material. */
export function statusCountsByMaterial(matrix: StudyMatrix) {
  return matrix.materials.map((m, i) => {
    const counts = Object.fromEntries(CELL_STATUS_ORDER.map((s) => [s, 0])) as Record<CellStatus, number>;
    for (const row of matrix.rows) counts[row.statuses[i]!] += 1;
    return { materialId: m.id, code: m.code, counts };
  });
}

/** The progress figures the overview polls: every lab for the coordinator, one lab's own row for an analyst. */
export async function studyProgress(study: Pick<Study, "id" | "code" | "state" | "resultsDue">, onlyEnrollmentId?: number) {
  const matrix = await studyMatrix(study.id, onlyEnrollmentId ? { enrollmentId: onlyEnrollmentId } : {});
  return {
    study: { id: study.id, code: study.code, state: study.state, resultsDue: study.resultsDue },
    materials: matrix.materials.map((m) => ({ id: m.id, code: m.code })),
    labs: matrix.rows.map((r) => ({ enrollmentId: r.id, labCode: r.labCode, labName: r.labName, statuses: r.statuses, submitted: r.submitted })),
    counts: statusCountsByMaterial(matrix),
  };
}

export type StudyProgress = Awaited<ReturnType<typeof studyProgress>>;
