/**
 * Queries as the coordinator raises and closes them: a question to a lab
 * about one of its cells, quoting the statistic that prompted it, e-mailed to
 * the lab's members and tracked open → answered → closed.
 */
import { and, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { cellNames, withCellContext } from "~/models/cell-context.server";
import { cells, enrollments, labMembers, labs, queries, users, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, composeEmail, sendEmail } from "~/server/email.server";
import type { CellRef } from "~/lib/review/cells";
import { writeRefusal } from "~/lib/write-rules";
import { findCellId } from "~/models/decisions.server";
import { FieldRefusal } from "~/lib/field-refusal";
import { asSentence } from "~/lib/format";


/** A refusal of the whole form, shown above it. */
export class QueryError extends FieldRefusal {
  constructor(message: string) {
    super("form", message);
  }
}

export type RaiseQueryInput = CellRef & { statistic: string; question: string; asksCorrection?: boolean };

/**
 * Raises a query on a cell and e-mails every member of the lab. A query that
 * asks for a correction lets the lab amend that one cell, with its reason,
 * until the query is closed — even after testing; nothing else reopens.
 */
export async function raiseQuery(study: Study, actorUserId: number, input: RaiseQueryInput, request: Request | null) {
  const refusal = writeRefusal("queries", study.state);
  if (refusal) throw new QueryError(refusal);
  const cellId = await findCellId(study.id, input);
  if (cellId === null) throw new QueryError(`Lab ${input.lab} has no ${input.response} results for material ${input.material}.`);
  const query = await db.transaction(async (tx) => {
    const [row] = await tx.insert(queries).values({ cellId, raisedBy: actorUserId, statistic: input.statistic, question: input.question, asksCorrection: input.asksCorrection ?? false }).returning();
    await recordAudit(
      { actorUserId, action: "query.raised", entityType: "query", entityId: row!.id, studyId: study.id, after: { lab: input.lab, material: input.material, response: input.response, statistic: input.statistic, asksCorrection: input.asksCorrection ?? false } },
      tx,
    );
    return row!;
  });
  const recipients = await db
    .select({ email: users.email, name: users.name })
    .from(cells)
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .innerJoin(labMembers, eq(labMembers.labId, enrollments.labId))
    .innerJoin(users, eq(users.id, labMembers.userId))
    .where(eq(cells.id, cellId));
  for (const recipient of recipients) {
    await sendEmail(
      composeEmail({
        to: recipient.email,
        subject: `${study.code}: a question about your ${input.material} results`,
        greeting: `Hello ${recipient.name},`,
        paragraphs: [
          `The coordinator of ${study.code} has a question about your lab's results for material ${input.material}, response ${input.response}.`,
          input.question,
          ...(input.statistic ? [asSentence(`What prompted it: ${input.statistic}`)] : []),
          ...(input.asksCorrection ? ["If a recording error is confirmed, you may amend this cell, with the reason, on its result entry page until the query is closed."] : []),
          "Nothing has been removed from the study; your answer helps decide whether the results stand.",
        ],
        action: { label: "Answer the query", url: appUrl(request, "/lab/queries") },
      }),
      { studyId: study.id },
    );
  }
  return query;
}

/** Every query of the study, newest first, with the lab's code and name (coordinators only). */
export async function listStudyQueries(studyId: number) {
  const rows = await withCellContext(
    db
      .select({
        id: queries.id,
        ...cellNames,
        labName: labs.name,
        statistic: queries.statistic,
        question: queries.question,
        asksCorrection: queries.asksCorrection,
        state: queries.state,
        answer: queries.answer,
        createdAt: queries.createdAt,
        answeredAt: queries.answeredAt,
        closedAt: queries.closedAt,
      })
      .from(queries)
      .innerJoin(cells, eq(cells.id, queries.cellId))
      .$dynamic(),
  )
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, studyId))
    .orderBy(desc(queries.createdAt), desc(queries.id));
  const iso = (d: Date | null) => d?.toISOString() ?? null;
  return rows.map((r) => ({ ...r, lab: r.lab ?? "—", createdAt: r.createdAt.toISOString(), answeredAt: iso(r.answeredAt), closedAt: iso(r.closedAt) }));
}

/** Closes a query of this study; a query of another study is reported as missing. */
export async function closeQuery(study: Study, actorUserId: number, queryId: number) {
  const refusal = writeRefusal("queries", study.state);
  if (refusal) throw new QueryError(refusal);
  const [found] = await db
    .select({ id: queries.id, state: queries.state })
    .from(queries)
    .innerJoin(cells, eq(cells.id, queries.cellId))
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .where(and(eq(queries.id, queryId), eq(enrollments.studyId, study.id)));
  if (!found) return null;
  if (found.state === "closed") throw new QueryError("This query is already closed.");
  await db.transaction(async (tx) => {
    await tx.update(queries).set({ state: "closed", closedAt: new Date() }).where(and(eq(queries.id, queryId), inArray(queries.state, ["open", "answered"])));
    await recordAudit({ actorUserId, action: "query.closed", entityType: "query", entityId: queryId, studyId: study.id, before: { state: found.state }, after: { state: "closed" } }, tx);
  });
  return found;
}
