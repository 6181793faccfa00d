/**
 * Precision statements: a frozen snapshot of the analysis (data version,
 * decisions, figures) with draft texts in the E691 and C670 forms, sent to
 * the committee, answered, and published.
 */
import { and, asc, desc, eq, inArray, isNotNull, isNull } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { enrollments, labs, materials, precisionStatements, responses, reviewRounds, roundReviewers, studyCoordinators, studyReviewers, users, votes, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { appUrl, composeEmail, sendEmail } from "~/server/email.server";
import { objectionStage, publicationCheck, QUORUM_SENTENCE } from "~/lib/review/publication";
import { writeRefusal } from "~/lib/write-rules";
import { c670Text, e691Text, type StatementSnapshot } from "~/lib/statement-text";
import { studyAnalysis } from "~/models/analysis.server";
import { closeOpenRound, transitionStudy } from "~/models/study-lifecycle.server";
import { FieldRefusal } from "~/lib/field-refusal";

export type Statement = Omit<typeof precisionStatements.$inferSelect, "snapshot"> & { snapshot: StatementSnapshot };

/** A refusal of the whole form, shown above it. */
export class StatementError extends FieldRefusal {
  constructor(message: string) {
    super("form", message);
  }
}

/** The study's responses and materials, in their order, as the analysis pages and the snapshot name them. */
export async function studyDesign(studyId: number) {
  const [responseRows, materialRows] = await Promise.all([
    db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.sortOrder)),
    db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder)),
  ]);
  return {
    responses: responseRows.map(({ key, name, unit, decimals }) => ({ key, name, unit, decimals })),
    materials: materialRows.map(({ code, description }) => ({ code, description })),
  };
}

/** Every version of the study's statement, newest first. */
export async function listStatements(studyId: number): Promise<Statement[]> {
  const rows = await db.select().from(precisionStatements).where(eq(precisionStatements.studyId, studyId)).orderBy(desc(precisionStatements.version));
  return rows.map((r) => ({ ...r, snapshot: r.snapshot as StatementSnapshot }));
}

export async function latestStatement(studyId: number) {
  return (await listStatements(studyId))[0] ?? null;
}

/** The labs that contributed submitted results: codes for everyone, names for the coordinator's report. */
export async function participatingLabs(studyId: number, analysis: StatementSnapshot["analysis"]) {
  const codes = new Set([...analysis.groups.flatMap((g) => g.labs.map((l) => l.lab)), ...analysis.excluded.map((e) => e.lab)]);
  const rows = await db
    .select({ code: enrollments.labCode, name: labs.name })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(and(eq(enrollments.studyId, studyId), isNotNull(enrollments.labCode)))
    .orderBy(asc(enrollments.labCode));
  return rows.filter((r) => codes.has(r.code!)).map((r) => ({ code: r.code!, name: r.name }));
}

/** Freezes the current analysis as a new statement version with generated draft texts. */
export async function freezeStatement(study: Study, actorUserId: number) {
  const refusal = writeRefusal("statements", study.state);
  if (refusal) throw new StatementError(refusal);
  const [analysis, design] = await Promise.all([studyAnalysis(study), studyDesign(study.id)]);
  if (!analysis.groups.some((g) => g.status === "computed")) throw new StatementError("No material has precision statistics yet; nothing to freeze.");
  const labCount = (await participatingLabs(study.id, analysis)).length;
  const snapshot: StatementSnapshot = {
    study: { code: study.code, title: study.title, testMethod: study.testMethod },
    dataVersion: study.dataVersion,
    frozenAt: new Date().toISOString(),
    labs: labCount,
    replicates: study.replicatesPerCell,
    materials: design.materials,
    responses: design.responses,
    analysis,
  };
  return db.transaction(async (tx) => {
    const [last] = await tx.select({ version: precisionStatements.version }).from(precisionStatements).where(eq(precisionStatements.studyId, study.id)).orderBy(desc(precisionStatements.version)).limit(1);
    const version = (last?.version ?? 0) + 1;
    const [row] = await tx
      .insert(precisionStatements)
      .values({ studyId: study.id, version, textE691: e691Text(snapshot), textC670: c670Text(snapshot), snapshot, dataVersion: study.dataVersion, createdBy: actorUserId })
      .returning();
    await recordAudit({ actorUserId, action: "statement.frozen", entityType: "precision_statement", entityId: row!.id, studyId: study.id, after: { version, dataVersion: study.dataVersion } }, tx);
    return row!;
  });
}

async function draftOf(study: Study, statementId: number) {
  const statement = await db.query.precisionStatements.findFirst({ where: and(eq(precisionStatements.id, statementId), eq(precisionStatements.studyId, study.id)) });
  if (!statement) return null;
  const latest = await latestStatement(study.id);
  if (latest?.id !== statement.id) throw new StatementError("A newer version exists; edit that one.");
  if (statement.state !== "draft") throw new StatementError("Only a draft can be changed; this version has gone to review.");
  return statement;
}

/** Saves the coordinator's wording; the figures stay those of the snapshot. */
export async function updateStatementText(study: Study, actorUserId: number, statementId: number, text: { textE691: string; textC670: string }) {
  const refusal = writeRefusal("statements", study.state);
  if (refusal) throw new StatementError(refusal);
  const statement = await draftOf(study, statementId);
  if (!statement) return null;
  await db.transaction(async (tx) => {
    await tx.update(precisionStatements).set(text).where(eq(precisionStatements.id, statementId));
    await recordAudit({ actorUserId, action: "statement.edited", entityType: "precision_statement", entityId: statementId, studyId: study.id, after: { version: statement.version } }, tx);
  });
  return statement;
}

/** The study's reviewers by name, for choosing the chair of a round. */
export async function reviewersByName(studyId: number) {
  return db
    .select({ id: users.id, name: users.name })
    .from(studyReviewers)
    .innerJoin(users, eq(users.id, studyReviewers.userId))
    .where(eq(studyReviewers.studyId, studyId))
    .orderBy(asc(users.name));
}

export async function studyReviewerIds(studyId: number) {
  return (await db.select({ id: studyReviewers.userId }).from(studyReviewers).where(eq(studyReviewers.studyId, studyId))).map((r) => r.id);
}

/** The owner and co-coordinators of a study, who hear of each objection. */
export async function coordinatorRecipients(study: Pick<Study, "id" | "ownerId">) {
  const co = (await db.select({ id: studyCoordinators.userId }).from(studyCoordinators).where(eq(studyCoordinators.studyId, study.id))).map((c) => c.id);
  return db.select({ email: users.email, name: users.name }).from(users).where(inArray(users.id, [study.ownerId, ...co]));
}

/**
 * Sends the latest draft to the committee: the study moves to in_review, the
 * version to in_review and a round opens with the study's reviewers as they
 * are now and the chosen chair, all in one transaction; every reviewer of the
 * round is e-mailed. Refused when results or decisions changed after the
 * snapshot was frozen.
 */
export async function sendToReview(study: Study, actorUserId: number, statementId: number, chairId: number, request: Request | null) {
  const refusal = writeRefusal("statements", study.state);
  if (refusal) throw new StatementError(refusal);
  const statement = await draftOf(study, statementId);
  if (!statement) return null;
  if (statement.dataVersion !== study.dataVersion) {
    throw new StatementError("Results or decisions changed after this version was frozen; freeze a new version so the numbers match the data.");
  }
  const reviewerIds = await studyReviewerIds(study.id);
  if (reviewerIds.length === 0) throw new StatementError("No reviewer is assigned to this study.");
  if (!reviewerIds.includes(chairId)) throw new StatementError("Choose the chair among the study’s reviewers.");
  const moved = await transitionStudy(study, "in_review", actorUserId, {
    owner: "statement",
    alongside: async (tx) => {
      await tx.update(precisionStatements).set({ state: "in_review", sentAt: new Date() }).where(eq(precisionStatements.id, statementId));
      const [round] = await tx.insert(reviewRounds).values({ statementId, chairId, openedBy: actorUserId }).returning();
      await tx.insert(roundReviewers).values(reviewerIds.map((userId) => ({ roundId: round!.id, userId })));
      await recordAudit({ actorUserId, action: "statement.sent", entityType: "precision_statement", entityId: statementId, studyId: study.id, after: { version: statement.version, reviewers: reviewerIds, chairId } }, tx);
    },
  });
  if (!moved.allowed) throw new StatementError(moved.problems.join(" "));
  const reviewers = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(inArray(users.id, reviewerIds));
  const chair = reviewers.find((r) => r.id === chairId)!;
  for (const reviewer of reviewers) {
    await sendEmail(
      composeEmail({
        to: reviewer.email,
        subject: `${study.code}: precision statement version ${statement.version} is ready for your review`,
        greeting: `Hello ${reviewer.name},`,
        paragraphs: [
          `The coordinator of ${study.code} (${study.title}) has sent version ${statement.version} of the precision statement to the committee.`,
          "Please read the statement and the blinded analysis, then approve, object with a reason, or abstain. You may change your vote until your objection is answered.",
          `${chair.name} chairs this round and rules on any objection its reviewer maintains after the coordinator's answer. ${QUORUM_SENTENCE}`,
        ],
        action: { label: "Review the statement", url: appUrl(request, `/review/${study.id}`) },
      }),
      { studyId: study.id },
    );
  }
  return statement;
}

/** The statement version currently before the committee, or null. */
export async function statementInReview(studyId: number) {
  const latest = await latestStatement(studyId);
  return latest?.state === "in_review" ? latest : null;
}

/** The open round of a study: its statement, chair and fixed reviewers; null when no round is open. */
export async function openRound(studyId: number) {
  const statement = await statementInReview(studyId);
  if (!statement) return null;
  const round = await db.query.reviewRounds.findFirst({ where: and(eq(reviewRounds.statementId, statement.id), eq(reviewRounds.outcome, "open")) });
  if (!round) return null;
  const reviewerIds = (await db.select({ id: roundReviewers.userId }).from(roundReviewers).where(eq(roundReviewers.roundId, round.id))).map((r) => r.id);
  return { statement, round, reviewerIds };
}

export type ObjectionAnswer = { voteId: number; answer: "upheld" | "not_upheld"; rationale: string };

/** Returns the version and the study to checking together with whatever `record` writes, or none of it. */
export async function returnStatement(study: Study, actorUserId: number, record: (tx: Transaction) => Promise<void>) {
  const moved = await transitionStudy(study, "checking", actorUserId, {
    owner: "statement",
    alongside: async (tx) => {
      await record(tx);
      await closeOpenRound(tx, study.id, "returned");
    },
  });
  if (!moved.allowed) throw new StatementError(moved.problems.join(" "));
}

/**
 * The coordinator answers one objection in writing. Upheld: the version is
 * returned and the study goes back to checking, so a revised version starts
 * a new round. Not upheld: the objection goes back to its reviewer, who may
 * withdraw or maintain it. The objector is e-mailed either way.
 */
export async function answerObjection(study: Study, actorUserId: number, input: ObjectionAnswer, request: Request | null) {
  const refusal = writeRefusal("review", study.state);
  if (refusal) throw new StatementError(refusal);
  const open = await openRound(study.id);
  if (!open) throw new StatementError("No committee round is open.");
  const vote = await db.query.votes.findFirst({ where: and(eq(votes.id, input.voteId), eq(votes.statementId, open.statement.id)) });
  if (!vote) return null;
  const stage = objectionStage(vote);
  if (stage === null) throw new StatementError("Only an objection can be answered.");
  if (stage !== "awaiting_answer") throw new StatementError("This objection has already been answered.");
  const recordAnswer = async (tx: Transaction) => {
    const answered = await tx
      .update(votes)
      .set({ answer: input.answer, answerRationale: input.rationale, answeredBy: actorUserId, answeredAt: new Date() })
      .where(and(eq(votes.id, vote.id), isNull(votes.answer), eq(votes.updatedAt, vote.updatedAt)))
      .returning({ id: votes.id });
    if (answered.length === 0) throw new StatementError("The reviewer changed this vote meanwhile; reload and read it again.");
    await recordAudit(
      { actorUserId, action: "objection.answered", entityType: "vote", entityId: vote.id, studyId: study.id, after: { answer: input.answer, version: open.statement.version }, reason: input.rationale },
      tx,
    );
  };
  if (input.answer === "upheld") await returnStatement(study, actorUserId, recordAnswer);
  else await db.transaction(recordAnswer);
  const objector = await db.query.users.findFirst({ where: eq(users.id, vote.reviewerId) });
  if (objector) {
    await sendEmail(
      composeEmail({
        to: objector.email,
        subject: `${study.code}: your objection was answered (${input.answer === "upheld" ? "upheld" : "not upheld"})`,
        greeting: `Hello ${objector.name},`,
        paragraphs: [
          `The coordinator of ${study.code} answered your objection to version ${open.statement.version}: ${input.answer === "upheld" ? "upheld — the statement will be revised and sent again." : "not upheld."}`,
          input.rationale,
          ...(input.answer === "not_upheld" ? ["Please withdraw your objection or maintain it; a maintained objection goes to the chair's ruling."] : []),
        ],
        action: { label: "Open the review", url: appUrl(request, `/review/${study.id}`) },
      }),
      { studyId: study.id },
    );
  }
  return vote;
}

/** Whether the version in review may be published, the tally, and what still stands in the way. */
export async function publicationStatus(studyId: number) {
  const open = await openRound(studyId);
  if (!open) {
    return { statement: null, round: null, check: { allowed: false, problems: ["No committee round is open."], awaited: [], tally: publicationCheck([], []).tally } };
  }
  const cast = await db
    .select({ reviewerId: votes.reviewerId, choice: votes.choice, answer: votes.answer, objectorReply: votes.objectorReply, ruling: votes.ruling })
    .from(votes)
    .where(eq(votes.statementId, open.statement.id));
  return { statement: open.statement, round: { id: open.round.id, chairId: open.round.chairId, reviewerIds: open.reviewerIds }, check: publicationCheck(open.reviewerIds, cast) };
}

/** Publishes the study with the approved version and closes the round; from then on every write is refused. */
export async function publishStudy(study: Study, actorUserId: number) {
  const refusal = writeRefusal("review", study.state);
  if (refusal) throw new StatementError(refusal);
  const { statement, check } = await publicationStatus(study.id);
  if (!statement || !check.allowed) throw new StatementError(check.problems.join(" "));
  const moved = await transitionStudy(study, "published", actorUserId, {
    owner: "statement",
    alongside: async (tx) => {
      await closeOpenRound(tx, study.id, "published");
      await recordAudit({ actorUserId, action: "statement.approved", entityType: "precision_statement", entityId: statement.id, studyId: study.id, after: { version: statement.version, tally: check.tally } }, tx);
    },
  });
  if (!moved.allowed) throw new StatementError(moved.problems.join(" "));
  return statement;
}

/** Votes on a version with the reviewer's name, for the coordinator and the committee alike (reviewers are not blinded). */
export async function votesOn(statementId: number) {
  const rows = await db
    .select({
      id: votes.id,
      reviewerId: votes.reviewerId,
      reviewer: users.name,
      choice: votes.choice,
      reason: votes.reason,
      answer: votes.answer,
      answerRationale: votes.answerRationale,
      objectorReply: votes.objectorReply,
      objectorReplyNote: votes.objectorReplyNote,
      ruling: votes.ruling,
      rulingReason: votes.rulingReason,
      updatedAt: votes.updatedAt,
    })
    .from(votes)
    .innerJoin(users, eq(users.id, votes.reviewerId))
    .where(eq(votes.statementId, statementId))
    .orderBy(asc(users.name));
  return rows.map((r) => ({ ...r, stage: objectionStage(r), updatedAt: r.updatedAt.toISOString() }));
}
