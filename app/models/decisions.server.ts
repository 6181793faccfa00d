/**
 * Cell decisions: the coordinator retains or excludes a lab × material ×
 * response cell, always with a reason. Each decision bumps the study's data
 * version (so cached analyses are recomputed) and enters the audit trail in
 * the same transaction.
 */
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cellNames, withCellContext } from "~/models/cell-context.server";
import { amendments, auditEvents, cellDecisions, cells, enrollments, materials, queries, responses, results, users, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import type { CellRef } from "~/lib/review/cells";
import { cellsAmendedAfterQuery } from "~/lib/review/amended-cells";
import { writeRefusal } from "~/lib/write-rules";
import { bumpDataVersion } from "~/models/analysis.server";
import { FieldRefusal } from "~/lib/field-refusal";


/** A refusal of the whole form, shown above it. */
export class DecisionError extends FieldRefusal {
  constructor(message: string) {
    super("form", message);
  }
}

/** The database id of a cell named by lab code, material code and response key, or null. */
export async function findCellId(studyId: number, cell: CellRef) {
  const [row] = await withCellContext(
    db
      .select({ id: cells.id })
      .from(cells)
      .$dynamic(),
  )
    .where(and(eq(enrollments.studyId, studyId), eq(enrollments.labCode, cell.lab), eq(materials.code, cell.material), eq(responses.key, cell.response)));
  return row?.id ?? null;
}

/** Every decision of the study, retained or excluded, with who made it. */
export async function listCellDecisions(studyId: number) {
  const rows = await withCellContext(
    db
      .select({
        cellId: cellDecisions.cellId,
        ...cellNames,
        decision: cellDecisions.decision,
        reason: cellDecisions.reason,
        decidedBy: users.name,
        decidedAt: cellDecisions.decidedAt,
      })
      .from(cellDecisions)
      .innerJoin(cells, eq(cells.id, cellDecisions.cellId))
      .$dynamic(),
  )
    .innerJoin(users, eq(users.id, cellDecisions.decidedBy))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(asc(enrollments.labCode), asc(materials.sortOrder), asc(responses.sortOrder));
  return rows.map((r) => ({ ...r, lab: r.lab ?? "—", decidedAt: r.decidedAt.toISOString() }));
}

/** Cells of the study (by lab code) whose values a lab amended while a correction query on them was open. */
export async function amendedAfterQueryCells(studyId: number): Promise<CellRef[]> {
  const studyCells = await withCellContext(
    db
      .select({ id: cells.id, ...cellNames })
      .from(cells)
      .$dynamic(),
  )
    .where(and(eq(enrollments.studyId, studyId), eq(cells.amended, true)));
  const refs = new Map(studyCells.flatMap((c) => (c.lab === null ? [] : [[c.id, { lab: c.lab, material: c.material, response: c.response }] as const])));
  if (refs.size === 0) return [];
  const ids = [...refs.keys()];
  const [amended, corrections] = await Promise.all([
    db.select({ cellId: amendments.cellId, at: amendments.createdAt, queryId: amendments.queryId }).from(amendments).where(inArray(amendments.cellId, ids)).orderBy(asc(amendments.createdAt)),
    db
      .select({ cellId: queries.cellId, id: queries.id, openedAt: queries.createdAt, closedAt: queries.closedAt })
      .from(queries)
      .where(and(inArray(queries.cellId, ids), eq(queries.asksCorrection, true))),
  ]);
  return cellsAmendedAfterQuery(
    amended.map(({ cellId, ...a }) => ({ ...refs.get(cellId)!, ...a })),
    corrections.map(({ cellId, ...q }) => ({ ...refs.get(cellId)!, ...q })),
  );
}

export type CellDecisionInput = CellRef & { decision: "retained" | "excluded"; reason: string };

/** Records (or changes) the decision on one cell. Throws DecisionError with a message for the page. */
export async function saveCellDecision(study: Study, actorUserId: number, input: CellDecisionInput) {
  const refusal = writeRefusal("decisions", study.state);
  if (refusal) throw new DecisionError(refusal);
  const cellId = await findCellId(study.id, input);
  if (cellId === null) throw new DecisionError(`Lab ${input.lab} has no ${input.response} results for material ${input.material}.`);
  const [hasResults] = await db.select({ n: sql<number>`count(*)` }).from(results).where(eq(results.cellId, cellId));
  if (!hasResults?.n) throw new DecisionError("This cell has no results to decide on.");
  return db.transaction(async (tx) => {
    const previous = await tx.query.cellDecisions.findFirst({ where: eq(cellDecisions.cellId, cellId) });
    const values = { decision: input.decision, reason: input.reason, decidedBy: actorUserId, decidedAt: new Date() };
    if (previous) await tx.update(cellDecisions).set(values).where(eq(cellDecisions.id, previous.id));
    else await tx.insert(cellDecisions).values({ cellId, ...values });
    await bumpDataVersion(tx, study.id);
    await recordAudit(
      {
        actorUserId,
        action: "cell_decision.saved",
        entityType: "cell",
        entityId: cellId,
        studyId: study.id,
        before: previous ? { decision: previous.decision, reason: previous.reason } : null,
        after: { lab: input.lab, material: input.material, response: input.response, decision: input.decision },
        reason: input.reason,
      },
      tx,
    );
    return cellId;
  });
}

/** The audit trail of the study's cell decisions, newest first. */
export async function decisionHistory(studyId: number) {
  const rows = await db
    .select({ id: auditEvents.id, at: auditEvents.createdAt, by: users.name, before: auditEvents.before, after: auditEvents.after, reason: auditEvents.reason })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorUserId))
    .where(and(eq(auditEvents.studyId, studyId), eq(auditEvents.action, "cell_decision.saved")))
    .orderBy(desc(auditEvents.createdAt), desc(auditEvents.id));
  return rows.map((r) => ({
    id: r.id,
    at: r.at.toISOString(),
    by: r.by ?? "—",
    after: r.after as CellRef & { decision: string },
    before: r.before as { decision: string } | null,
    reason: r.reason ?? "",
  }));
}

/** Submitted results (and their surface photos) by lab code, of one material, narrowed to one lab and response when given. */
async function submittedResults(studyId: number, where: { material: string; lab?: string; response?: string }) {
  const rows = await withCellContext(
    db
      .select({
        ...cellNames,
        replicate: results.replicate,
        value: results.value,
        photoFileId: results.photoAttachmentId,
      })
      .from(results)
      .innerJoin(cells, eq(cells.id, results.cellId))
      .$dynamic(),
  )
    .where(
      and(
        eq(enrollments.studyId, studyId),
        eq(cells.status, "submitted"),
        eq(materials.code, where.material),
        where.lab === undefined ? undefined : eq(enrollments.labCode, where.lab),
        where.response === undefined ? undefined : eq(responses.key, where.response),
      ),
    )
    .orderBy(asc(enrollments.labCode), asc(responses.sortOrder), asc(results.replicate));
  return rows.map((r) => ({ ...r, lab: r.lab ?? "—" }));
}

/** The submitted results (and their surface photos) of one lab × material × response cell. */
export function cellEvidence(studyId: number, cell: CellRef) {
  return submittedResults(studyId, cell);
}

/** Every submitted replicate value of one material, by lab code only, as the committee reads them (no photos). */
export async function submittedResultsOfMaterial(studyId: number, material: string) {
  return (await submittedResults(studyId, { material })).map(({ photoFileId: _, ...r }) => r);
}
