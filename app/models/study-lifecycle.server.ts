/**
 * Moves a study through its states with the guards of ~/lib/study-lifecycle,
 * recording each move in the audit trail. Each move belongs to one page
 * (`owner`); the committee review adds its own guards through `extraGuards`
 * and writes the statement and round alongside the move.
 */
import { and, count, eq, inArray } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { enrollments, materials, precisionStatements, reviewRounds, studies, type StudyState, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { checkTransition, moveOwner, type MoveOwner, type TransitionCheck } from "~/lib/study-lifecycle";


/** A further condition on a move; returns a problem to show, or null when the move may go ahead. */
export type TransitionGuard = (study: Study, to: StudyState) => Promise<string | null> | string | null;

export async function transitionFacts(studyId: number) {
  const [[m], [l]] = await Promise.all([
    db.select({ n: count() }).from(materials).where(eq(materials.studyId, studyId)),
    db
      .select({ n: count() })
      .from(enrollments)
      .where(and(eq(enrollments.studyId, studyId), eq(enrollments.state, "accepted"))),
  ]);
  return { materials: m?.n ?? 0, acceptedLabs: l?.n ?? 0 };
}

export async function previewTransition(study: Study, to: StudyState, extraGuards: TransitionGuard[] = [], owner: MoveOwner = "setup"): Promise<TransitionCheck> {
  const check = checkTransition(study.state, to, await transitionFacts(study.id));
  const owning = moveOwner(study.state, to);
  if (owning && owning !== owner) check.problems.push("This move is made on the statement page, together with the statement and its committee round.");
  for (const guard of extraGuards) {
    const problem = await guard(study, to);
    if (problem) check.problems.push(problem);
  }
  return { ...check, allowed: check.problems.length === 0 };
}

/**
 * Applies a move if the rules allow it. The update is conditional on the state
 * read, so two people moving the study at once cannot both succeed.
 * `alongside` writes what goes with the move (a statement's state, say) in the
 * same transaction, so the two never disagree.
 */
export async function transitionStudy(
  study: Study,
  to: StudyState,
  actorUserId: number,
  { extraGuards = [], alongside, owner = "setup" }: { extraGuards?: TransitionGuard[]; alongside?: (tx: Transaction) => Promise<void>; owner?: MoveOwner } = {},
) {
  const check = await previewTransition(study, to, extraGuards, owner);
  if (!check.allowed) return check;
  const moved = await db.transaction(async (tx) => {
    const updated = await tx
      .update(studies)
      .set({ state: to })
      .where(and(eq(studies.id, study.id), eq(studies.state, study.state)))
      .returning({ id: studies.id });
    if (updated.length === 0) return false;
    await recordAudit(
      { actorUserId, action: "study_state_changed", entityType: "study", entityId: study.id, studyId: study.id, before: { state: study.state }, after: { state: to } },
      tx,
    );
    if (to === "cancelled") await closeOpenRound(tx, study.id, "cancelled");
    await alongside?.(tx);
    return true;
  });
  if (!moved) return { allowed: false, problems: ["Someone else changed the study's state meanwhile; reload and try again."], warnings: [] };
  return check;
}

/** Ends the study's open committee round (if any) with its statement version, in the transaction of the move that ends it. */
export async function closeOpenRound(tx: Transaction, studyId: number, outcome: "published" | "returned" | "cancelled") {
  const open = await tx
    .select({ roundId: reviewRounds.id, statementId: precisionStatements.id })
    .from(reviewRounds)
    .innerJoin(precisionStatements, eq(precisionStatements.id, reviewRounds.statementId))
    .where(and(eq(precisionStatements.studyId, studyId), eq(reviewRounds.outcome, "open")));
  if (open.length === 0) return;
  await tx.update(reviewRounds).set({ outcome, closedAt: new Date() }).where(inArray(reviewRounds.id, open.map((r) => r.roundId)));
  await tx
    .update(precisionStatements)
    .set({ state: outcome === "published" ? "approved" : "returned" })
    .where(and(inArray(precisionStatements.id, open.map((r) => r.statementId)), eq(precisionStatements.state, "in_review")));
}
