/**
 * Queries from the coordinator to a lab about its cells, as the lab sees and
 * answers them. Every read is scoped to the analyst's own labs.
 */
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { withCellContext } from "~/models/cell-context.server";
import { cells, enrollments, materials, queries, responses, studies, studyCoordinators, users } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, composeEmail, sendEmail } from "~/server/email.server";
import { enrollmentRefusal, writeRefusal } from "~/lib/write-rules";
import type { Enrollment } from "~/models/results.server";

const queryView = {
  id: queries.id,
  question: queries.question,
  asksCorrection: queries.asksCorrection,
  statistic: queries.statistic,
  state: queries.state,
  answer: queries.answer,
  answeredAt: queries.answeredAt,
  createdAt: queries.createdAt,
  studyId: studies.id,
  studyCode: studies.code,
  materialId: materials.id,
  materialCode: materials.code,
  responseName: responses.name,
  labCode: enrollments.labCode,
};

function fromQueries() {
  return withCellContext(
    db
      .select(queryView)
      .from(queries)
      .innerJoin(cells, eq(cells.id, queries.cellId))
      .$dynamic(),
  )
    .innerJoin(studies, eq(studies.id, enrollments.studyId));
}

/** Every query to the user's labs, open ones first. */
export async function listLabQueries(labIds: number[]) {
  if (labIds.length === 0) return [];
  const rows = await fromQueries().where(inArray(enrollments.labId, labIds)).orderBy(asc(studies.code), desc(queries.createdAt));
  const order = { open: 0, answered: 1, closed: 2 } as const;
  return rows.sort((a, b) => order[a.state] - order[b.state]);
}

export async function openQueriesOfMaterial(enrollment: Enrollment, materialId: number) {
  return fromQueries().where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, materialId), eq(queries.state, "open")));
}

/** The lab's cells of one material that a correction query, not yet closed, lets the lab amend after testing (by response id). */
export async function correctableResponses(enrollment: Enrollment, materialId: number) {
  const rows = await db
    .select({ responseId: cells.responseId })
    .from(queries)
    .innerJoin(cells, eq(cells.id, queries.cellId))
    .where(and(eq(cells.enrollmentId, enrollment.id), eq(cells.materialId, materialId), eq(queries.asksCorrection, true), inArray(queries.state, ["open", "answered"])));
  return [...new Set(rows.map((r) => r.responseId))];
}

export class QueryAnswerError extends Error {}

/**
 * Records the lab's answer and tells the study's coordinators by e-mail. A
 * query outside the user's labs is reported as missing, like any other 404.
 */
export async function answerQuery(queryId: number, labIds: number[], answer: string, user: { id: number; name: string }, request: Request | null) {
  const [found] = labIds.length
    ? await withCellContext(
        db
          .select({ id: queries.id, state: queries.state, studyState: studies.state, enrollmentState: enrollments.state, studyId: enrollments.studyId, studyCode: studies.code, ownerId: studies.ownerId, labCode: enrollments.labCode, materialCode: materials.code, responseName: responses.name })
          .from(queries)
          .innerJoin(cells, eq(cells.id, queries.cellId))
          .$dynamic(),
      )
        .innerJoin(studies, eq(studies.id, enrollments.studyId))
        .where(and(eq(queries.id, queryId), inArray(enrollments.labId, labIds)))
    : [];
  if (!found) return null;
  if (found.state === "closed") throw new QueryAnswerError("This query is closed; the coordinator no longer needs an answer.");
  const refusal = writeRefusal("queryAnswers", found.studyState) ?? enrollmentRefusal(found.enrollmentState);
  if (refusal) throw new QueryAnswerError(refusal);
  await db.transaction(async (tx) => {
    await tx.update(queries).set({ answer, state: "answered", answeredBy: user.id, answeredAt: new Date() }).where(eq(queries.id, queryId));
    await recordAudit({ actorUserId: user.id, action: "query.answered", entityType: "query", entityId: queryId, studyId: found.studyId, after: { answer } }, tx);
  });
  const coordinatorIds = (await db.select({ id: studyCoordinators.userId }).from(studyCoordinators).where(eq(studyCoordinators.studyId, found.studyId))).map((c) => c.id);
  const recipients = await db.select({ email: users.email, name: users.name }).from(users).where(inArray(users.id, [found.ownerId, ...coordinatorIds]));
  for (const recipient of recipients) {
    await sendEmail(
      composeEmail({
        to: recipient.email,
        subject: `${found.studyCode}: lab ${found.labCode ?? ""} answered your query on ${found.materialCode}`,
        greeting: `Hello ${recipient.name},`,
        paragraphs: [
          `Lab ${found.labCode ?? ""} answered your query about ${found.materialCode}, ${found.responseName.toLowerCase()}:`,
          answer,
        ],
        action: { label: "See the study's results", url: appUrl(request, `/studies/${found.studyId}/results`) },
      }),
      { studyId: found.studyId },
    );
  }
  return found;
}
