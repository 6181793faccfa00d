/**
 * The committee's side of a round: votes (approve, object with a reason,
 * abstain — changeable until an objection is answered), the objector's reply
 * to a "not upheld" answer, the chair's ruling on a maintained objection, and
 * comments on the version in review. Only the reviewers fixed when the round
 * opened take part. Reviewers see lab codes only.
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { precisionStatements, reviewComments, studies, studyReviewers, users, votes, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, composeEmail, sendEmail } from "~/server/email.server";
import { objectionStage, type VoteChoice } from "~/lib/review/publication";
import { writeRefusal } from "~/lib/write-rules";
import { coordinatorRecipients, openRound, returnStatement } from "~/models/statement.server";


export class ReviewError extends Error {}

/** The open round, for a reviewer who belongs to it. */
async function roundFor(study: Study, reviewerId: number) {
  const refusal = writeRefusal("review", study.state);
  if (refusal) throw new ReviewError(refusal);
  const open = await openRound(study.id);
  if (!open) throw new ReviewError("No statement is in review; the round is closed.");
  if (!open.reviewerIds.includes(reviewerId)) throw new ReviewError("You are not a reviewer of this round; it was sent to the committee before you joined.");
  return open;
}

/** E-mails each person; the study's mailbox keeps the messages beside the study. */
async function notify(studyId: number, to: { email: string; name: string }[], subject: string, paragraphs: string[], url: string) {
  for (const person of to) {
    await sendEmail(composeEmail({ to: person.email, subject, greeting: `Hello ${person.name},`, paragraphs, action: { label: "Open the statement", url } }), { studyId });
  }
}

/**
 * Casts or changes the reviewer's vote. Once the coordinator has answered the
 * reviewer's objection, the vote stands: the reviewer replies to the answer
 * instead. A new objection is e-mailed to the coordinators.
 */
export async function castVote(study: Study, reviewerId: number, input: { choice: VoteChoice; reason: string | null }, request: Request | null = null) {
  const { statement } = await roundFor(study, reviewerId);
  const objected = await db.transaction(async (tx) => {
    const previous = await tx.query.votes.findFirst({ where: and(eq(votes.statementId, statement.id), eq(votes.reviewerId, reviewerId)) });
    if (previous?.answer) throw new ReviewError("The coordinator has answered your objection; withdraw or maintain it instead of changing the vote.");
    const values = { choice: input.choice, reason: input.reason, updatedAt: new Date() };
    if (previous) await tx.update(votes).set(values).where(eq(votes.id, previous.id));
    else await tx.insert(votes).values({ statementId: statement.id, reviewerId, ...values });
    await recordAudit(
      { actorUserId: reviewerId, action: previous ? "vote.changed" : "vote.cast", entityType: "precision_statement", entityId: statement.id, studyId: study.id, before: previous ? { choice: previous.choice } : null, after: { choice: input.choice, version: statement.version }, reason: input.reason },
      tx,
    );
    return input.choice === "object" && (previous?.choice !== "object" || previous.reason !== input.reason);
  });
  if (objected) {
    const reviewer = await db.query.users.findFirst({ where: eq(users.id, reviewerId) });
    await notify(study.id, 
      await coordinatorRecipients(study),
      `${study.code}: ${reviewer?.name ?? "a reviewer"} objects to version ${statement.version}`,
      [`${reviewer?.name ?? "A reviewer"} objects to version ${statement.version} of the precision statement of ${study.code}:`, input.reason ?? "", "Answer the objection in writing: upheld (the statement is revised) or not upheld (with the rationale)."],
      appUrl(request, `/studies/${study.id}/statement`),
    );
  }
  return statement;
}

export type ObjectorReply = { reply: "withdrawn" | "maintained"; note: string };

/** The objector withdraws or maintains their objection after a "not upheld" answer; a maintained one goes to the chair. */
export async function replyToAnswer(study: Study, reviewerId: number, input: ObjectorReply, request: Request | null = null) {
  const { statement, round } = await roundFor(study, reviewerId);
  const vote = await db.query.votes.findFirst({ where: and(eq(votes.statementId, statement.id), eq(votes.reviewerId, reviewerId)) });
  if (!vote || objectionStage(vote) !== "awaiting_objector") throw new ReviewError("You have no objection answered “not upheld” awaiting your reply.");
  await db.transaction(async (tx) => {
    await tx.update(votes).set({ objectorReply: input.reply, objectorReplyNote: input.note || null, objectorRepliedAt: new Date() }).where(eq(votes.id, vote.id));
    await recordAudit({ actorUserId: reviewerId, action: `objection.${input.reply}`, entityType: "vote", entityId: vote.id, studyId: study.id, after: { version: statement.version }, reason: input.note || null }, tx);
  });
  const url = appUrl(request, `/studies/${study.id}/statement`);
  const reviewer = await db.query.users.findFirst({ where: eq(users.id, reviewerId) });
  const subject = `${study.code}: ${reviewer?.name ?? "a reviewer"} ${input.reply === "withdrawn" ? "withdrew" : "maintains"} an objection`;
  await notify(study.id, await coordinatorRecipients(study), subject, [subject + ".", input.note].filter(Boolean), url);
  if (input.reply === "maintained" && round.chairId !== reviewerId) {
    const chair = await db.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, round.chairId));
    await notify(study.id, chair, `${study.code}: a maintained objection awaits your ruling`, [`As chair of the round on version ${statement.version}, please rule on the objection ${reviewer?.name ?? "a reviewer"} maintains, with your reason.`], appUrl(request, `/review/${study.id}`));
  }
}

export type Ruling = { voteId: number; ruling: "upheld" | "not_upheld"; reason: string };

/**
 * The chair rules on a maintained objection, with a reason. Upheld returns
 * the statement (the study goes back to checking); not upheld lets the round
 * go on. The chair never rules on their own objection.
 */
export async function ruleOnObjection(study: Study, chairId: number, input: Ruling, request: Request | null = null) {
  const { statement, round } = await roundFor(study, chairId);
  if (round.chairId !== chairId) throw new ReviewError("Only the chair of the round rules on a maintained objection.");
  const vote = await db.query.votes.findFirst({ where: and(eq(votes.id, input.voteId), eq(votes.statementId, statement.id)) });
  if (!vote) return null;
  if (vote.reviewerId === chairId) throw new ReviewError("The chair does not rule on their own objection; only a revised statement answers it.");
  if (objectionStage(vote) !== "awaiting_ruling") throw new ReviewError("This objection is not awaiting a ruling.");
  const record = async (tx: Transaction) => {
    await tx.update(votes).set({ ruling: input.ruling, rulingReason: input.reason, ruledBy: chairId, ruledAt: new Date() }).where(eq(votes.id, vote.id));
    await recordAudit({ actorUserId: chairId, action: "objection.ruled", entityType: "vote", entityId: vote.id, studyId: study.id, after: { ruling: input.ruling, version: statement.version }, reason: input.reason }, tx);
  };
  if (input.ruling === "upheld") await returnStatement(study, chairId, record);
  else await db.transaction(record);
  const objector = await db.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, vote.reviewerId));
  const subject = `${study.code}: the chair ruled on a maintained objection (${input.ruling === "upheld" ? "upheld" : "not upheld"})`;
  await notify(study.id, [...objector, ...(await coordinatorRecipients(study))], subject, [subject + ".", input.reason], appUrl(request, `/review/${study.id}`));
  return vote;
}

export async function addComment(study: Study, authorId: number, body: string) {
  const { statement } = await roundFor(study, authorId);
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
