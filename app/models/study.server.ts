import { and, asc, count, desc, eq, inArray, isNull, or } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { batches, cells, enrollments, invitations, labs, materials, queries, responses, results, shipments, studies, studyCoordinators, studyReviewers, type Study, type StudyKind } from "~/db/schema";
import { CELL_STATUS_ORDER, type CellStatus, cellStatusOf } from "~/lib/cell-status";
import type { SessionUser } from "~/models/user.server";
import { readPage } from "~/lib/paging";
import { formatDate } from "~/lib/format";
import type { LabStudyFacts } from "~/lib/lab-todo";

/** Writes a new study's row, of any kind, inside the transaction that sets up the rest of it. */
export async function insertStudy(tx: Transaction, values: typeof studies.$inferInsert) {
  const [study] = await tx.insert(studies).values(values).returning();
  return study!;
}

/** Studies of `kind` that the user owns or coordinates; every one for an admin. */
export function coordinatedBy(user: SessionUser, kind: StudyKind | "any") {
  const coordinated = db.select({ id: studyCoordinators.studyId }).from(studyCoordinators).where(eq(studyCoordinators.userId, user.id));
  return and(
    kind === "any" ? undefined : eq(studies.kind, kind),
    user.roles.includes("admin") ? undefined : or(eq(studies.ownerId, user.id), inArray(studies.id, coordinated)),
  );
}

/**
 * Studies the user may read through the API: those they coordinate, review
 * (unless `reviewed` is false: rounds have no reviewers) or have a lab
 * enrolled in; every one for an admin.
 */
export function readableThroughApi(user: SessionUser, { reviewed = true }: { reviewed?: boolean } = {}) {
  if (user.roles.includes("admin")) return undefined;
  return or(
    coordinatedBy(user, "any"),
    reviewed ? inArray(studies.id, db.select({ id: studyReviewers.studyId }).from(studyReviewers).where(eq(studyReviewers.userId, user.id))) : undefined,
    user.labIds.length ? inArray(studies.id, db.select({ id: enrollments.studyId }).from(enrollments).where(inArray(enrollments.labId, user.labIds))) : undefined,
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

/**
 * The facts behind each enrollment's to-do list on the lab home (~/lib/lab-todo),
 * a few queries for the whole page: materials, batches, replicate values
 * (drafts included), submitted cells, open queries, the latest shipment and
 * a pending invitation.
 */
export async function labTodoFacts(rows: { enrollmentId: number; enrollmentState: LabStudyFacts["enrollmentState"]; studyId: number }[]): Promise<Map<number, LabStudyFacts>> {
  const facts = new Map<number, LabStudyFacts>();
  if (rows.length === 0) return facts;
  const enrollmentIds = rows.map((r) => r.enrollmentId);
  const studyIds = [...new Set(rows.map((r) => r.studyId))];
  const [studyRows, materialRows, responseCounts, batchRows, valueCounts, submittedCells, openQueries, shipmentRows, invitationRows] = await Promise.all([
    db.select().from(studies).where(inArray(studies.id, studyIds)),
    db.select({ id: materials.id, studyId: materials.studyId, code: materials.code }).from(materials).where(inArray(materials.studyId, studyIds)).orderBy(asc(materials.sortOrder), asc(materials.code)),
    db.select({ studyId: responses.studyId, n: count() }).from(responses).where(inArray(responses.studyId, studyIds)).groupBy(responses.studyId),
    db.select({ enrollmentId: batches.enrollmentId, materialId: batches.materialId, batchedAt: batches.batchedAt, slumpMm: batches.slumpMm }).from(batches).where(inArray(batches.enrollmentId, enrollmentIds)),
    db
      .select({ enrollmentId: cells.enrollmentId, materialId: cells.materialId, n: count() })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .where(inArray(cells.enrollmentId, enrollmentIds))
      .groupBy(cells.enrollmentId, cells.materialId),
    db
      .select({ enrollmentId: cells.enrollmentId, materialId: cells.materialId, n: count() })
      .from(cells)
      .where(and(inArray(cells.enrollmentId, enrollmentIds), eq(cells.status, "submitted")))
      .groupBy(cells.enrollmentId, cells.materialId),
    db
      .select({ enrollmentId: cells.enrollmentId, n: count() })
      .from(queries)
      .innerJoin(cells, eq(cells.id, queries.cellId))
      .where(and(inArray(cells.enrollmentId, enrollmentIds), eq(queries.state, "open")))
      .groupBy(cells.enrollmentId),
    db.select().from(shipments).where(inArray(shipments.enrollmentId, enrollmentIds)).orderBy(asc(shipments.createdAt), asc(shipments.id)),
    db.select().from(invitations).where(and(inArray(invitations.enrollmentId, enrollmentIds), isNull(invitations.usedAt))).orderBy(asc(invitations.createdAt), asc(invitations.id)),
  ]);
  const perMaterial = (list: { enrollmentId: number; materialId: number; n: number }[], enrollmentId: number, materialId: number) =>
    list.find((x) => x.enrollmentId === enrollmentId && x.materialId === materialId)?.n ?? 0;
  for (const row of rows) {
    const study = studyRows.find((s) => s.id === row.studyId)!;
    const shipment = shipmentRows.filter((s) => s.enrollmentId === row.enrollmentId).at(-1);
    const invitation = invitationRows.filter((i) => i.enrollmentId === row.enrollmentId).at(-1);
    facts.set(row.enrollmentId, {
      studyId: study.id,
      studyState: study.state,
      enrollmentState: row.enrollmentState,
      enrollmentDeadline: study.enrollmentDeadline,
      resultsDue: study.resultsDue,
      replicatesPerCell: study.replicatesPerCell,
      responseCount: responseCounts.find((r) => r.studyId === study.id)?.n ?? 0,
      invitation: invitation && invitation.expiresAt.getTime() > Date.now() ? { email: invitation.email, expiresOn: formatDate(invitation.expiresAt) } : null,
      shipment: shipment ? { status: shipment.status, shippedOn: shipment.shippedOn } : null,
      materials: materialRows
        .filter((m) => m.studyId === study.id)
        .map((m) => {
          const batch = batchRows.find((b) => b.enrollmentId === row.enrollmentId && b.materialId === m.id);
          return {
            id: m.id,
            code: m.code,
            batchRecorded: Boolean(batch && (batch.batchedAt || batch.slumpMm !== null)),
            valuesEntered: perMaterial(valueCounts, row.enrollmentId, m.id),
            cellsSubmitted: perMaterial(submittedCells, row.enrollmentId, m.id),
          };
        }),
      openQueries: openQueries.find((q) => q.enrollmentId === row.enrollmentId)?.n ?? 0,
    });
  }
  return facts;
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

/** The study's protocol file and its coordinator, for the lab's protocol page. */
export async function studyBrief(study: Study) {
  const [protocol, coordinator] = await Promise.all([
    study.protocolAttachmentId
      ? db.query.attachments.findFirst({ where: (a, { eq: is }) => is(a.id, study.protocolAttachmentId!), columns: { id: true, originalName: true } })
      : Promise.resolve(undefined),
    db.query.users.findFirst({ where: (u, { eq: is }) => is(u.id, study.ownerId), columns: { name: true, email: true } }),
  ]);
  return { protocol: protocol ?? null, coordinator: coordinator ?? null };
}
