/**
 * Moves a study through its states with the guards of ~/lib/study-lifecycle,
 * recording each move in the audit trail. Other parts of the product (the
 * committee review) add their own guards through `extraGuards`.
 */
import { and, count, eq } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { enrollments, materials, studies, type StudyState, type Study } from "~/db/schema";
import { recordAudit } from "~/server/audit.server";
import { checkTransition, resultsEditable, type TransitionCheck } from "~/lib/study-lifecycle";


export class StudyStateError extends Error {}

/** Refuses result changes unless the study is testing; lab pages call this before every write. */
export function assertResultsEditable(study: Pick<Study, "state">) {
  if (!resultsEditable(study.state)) {
    throw new StudyStateError("Results can be entered or changed only while the study is testing.");
  }
}

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

export async function previewTransition(study: Study, to: StudyState, extraGuards: TransitionGuard[] = []): Promise<TransitionCheck> {
  const check = checkTransition(study.state, to, await transitionFacts(study.id));
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
  { extraGuards = [], alongside }: { extraGuards?: TransitionGuard[]; alongside?: (tx: Transaction) => Promise<void> } = {},
) {
  const check = await previewTransition(study, to, extraGuards);
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
    await alongside?.(tx);
    return true;
  });
  if (!moved) return { allowed: false, problems: ["Someone else changed the study's state meanwhile; reload and try again."], warnings: [] };
  return check;
}
