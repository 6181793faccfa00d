/**
 * The committee's side of a review round: votes (approve, object with a
 * reason, abstain — changeable until the round closes) and comments on the
 * statement version in review. Reviewers see lab codes only.
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { precisionStatements, reviewComments, studies, studyReviewers, users, votes, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import type { VoteChoice } from "~/lib/review/publication";
import { reviewRefusal } from "~/lib/review/write-rules";
import { statementInReview } from "~/models/statement.server";


export class ReviewError extends Error {}

async function openRound(study: Study) {
  const refusal = reviewRefusal(study.state);
  if (refusal) throw new ReviewError(refusal);
  const statement = await statementInReview(study.id);
  if (!statement) throw new ReviewError("No statement is in review; the round is closed.");
  return statement;
}

/** Casts or changes the reviewer's vote. A changed vote loses the answer given to the earlier objection. */
export async function castVote(study: Study, reviewerId: number, input: { choice: VoteChoice; reason: string | null }) {
  const statement = await openRound(study);
  await db.transaction(async (tx) => {
    const previous = await tx.query.votes.findFirst({ where: and(eq(votes.statementId, statement.id), eq(votes.reviewerId, reviewerId)) });
    const values = { choice: input.choice, reason: input.reason, updatedAt: new Date() };
    const unchanged = previous && previous.choice === input.choice && (previous.reason ?? null) === input.reason;
    if (previous) {
      await tx
        .update(votes)
        .set(unchanged ? values : { ...values, answer: null, answerRationale: null, answeredBy: null, answeredAt: null })
        .where(eq(votes.id, previous.id));
    } else {
      await tx.insert(votes).values({ statementId: statement.id, reviewerId, ...values });
    }
    await recordAudit(
      { actorUserId: reviewerId, action: previous ? "vote.changed" : "vote.cast", entityType: "precision_statement", entityId: statement.id, studyId: study.id, before: previous ? { choice: previous.choice } : null, after: { choice: input.choice, version: statement.version }, reason: input.reason },
      tx,
    );
  });
  return statement;
}

export async function addComment(study: Study, authorId: number, body: string) {
  const statement = await openRound(study);
  await db.transaction(async (tx) => {
    const [row] = await tx.insert(reviewComments).values({ statementId: statement.id, authorId, body }).returning();
    await recordAudit({ actorUserId: authorId, action: "review_comment.added", entityType: "review_comment", entityId: row!.id, studyId: study.id, after: { version: statement.version } }, tx);
  });
  return statement;
}

/** Comments on a version, oldest first, with their author's name. */
export async function commentsOn(statementId: number) {
  const rows = await db
    .select({ id: reviewComments.id, author: users.name, body: reviewComments.body, createdAt: reviewComments.createdAt })
    .from(reviewComments)
    .innerJoin(users, eq(users.id, reviewComments.authorId))
    .where(eq(reviewComments.statementId, statementId))
    .orderBy(asc(reviewComments.createdAt), asc(reviewComments.id));
  return rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() }));
}

/** For the reviewer's list: per assigned study, whether a vote from them is awaited on the version in review. */
export async function awaitedVotes(reviewerId: number) {
  const assigned = await db.select({ studyId: studyReviewers.studyId }).from(studyReviewers).where(eq(studyReviewers.userId, reviewerId));
  const ids = assigned.map((a) => a.studyId);
  if (ids.length === 0) return new Map<number, boolean>();
  const inReview = await db
    .select({ studyId: precisionStatements.studyId, statementId: precisionStatements.id })
    .from(precisionStatements)
    .innerJoin(studies, eq(studies.id, precisionStatements.studyId))
    .where(and(inArray(precisionStatements.studyId, ids), eq(precisionStatements.state, "in_review"), eq(studies.state, "in_review")));
  const mine = inReview.length
    ? await db.select({ statementId: votes.statementId }).from(votes).where(and(eq(votes.reviewerId, reviewerId), inArray(votes.statementId, inReview.map((s) => s.statementId))))
    : [];
  const voted = new Set(mine.map((v) => v.statementId));
  return new Map(inReview.map((s) => [s.studyId, !voted.has(s.statementId)]));
}
