/**
 * Which study state may follow which, and what each move needs. Pure rules:
 * the model module gathers the facts from the database and applies them.
 */
import type { StudyState } from "~/db/schema";

/** At least this many accepted labs before testing can start. */
export const MIN_LABS_FOR_TESTING = 3;
/** Below this many labs a precision statement is usually not written (common practice: E691 asks for at least 6). */
export const RECOMMENDED_MIN_LABS = 6;

/**
 * The page that owns each move. The setup page moves a study up to checking
 * and may cancel it; only the statement page sends it to the committee, takes
 * it back to checking (a returned statement) or publishes it, each together
 * with the statement and the round. Nothing moves a study back to testing:
 * corrections after testing go through correction queries.
 */
export type MoveOwner = "setup" | "statement";

const NEXT: Record<StudyState, Partial<Record<StudyState, MoveOwner>>> = {
  draft: { recruiting: "setup", cancelled: "setup" },
  recruiting: { draft: "setup", testing: "setup", cancelled: "setup" },
  testing: { checking: "setup", cancelled: "setup" },
  checking: { in_review: "statement", cancelled: "setup" },
  in_review: { checking: "statement", published: "statement", cancelled: "setup" },
  published: {},
  cancelled: {},
};

export function allowedNextStates(from: StudyState, owner?: MoveOwner): StudyState[] {
  return (Object.entries(NEXT[from]) as [StudyState, MoveOwner][]).filter(([, by]) => !owner || by === owner).map(([to]) => to);
}

/** What happens on each move, for the confirmation a person reads before it. */
export const MOVE_CONSEQUENCES: Partial<Record<StudyState, string>> = {
  recruiting: "Labs can then be invited. Responses and materials stay editable until testing starts.",
  draft: "Recruiting stops; open invitations stay valid.",
  testing: "Replicates per cell, responses, materials and the protocol become fixed. Labs can enter results.",
  checking: "Labs can no longer enter or change results, except through a correction query on a named cell.",
  in_review: "The statement and its figures are frozen for the committee. The reviewers of this round are fixed and e-mailed.",
  published: "The study and its statement become read-only for good.",
  cancelled: "The study becomes read-only for good. Any open committee round is closed.",
};

/** What the rules need to know about the study. */
export type TransitionFacts = { materials: number; acceptedLabs: number };

export type TransitionCheck = { allowed: boolean; problems: string[]; warnings: string[] };

export function checkTransition(from: StudyState, to: StudyState, facts: TransitionFacts): TransitionCheck {
  const problems: string[] = [];
  const warnings: string[] = [];
  if (!NEXT[from][to]) {
    problems.push(`A study cannot go from ${from.replace("_", " ")} to ${to.replace("_", " ")}.`);
  }
  if (to === "testing" && from === "recruiting") {
    if (facts.materials === 0) problems.push("Add at least one material before testing starts.");
    if (facts.acceptedLabs < MIN_LABS_FOR_TESTING) {
      problems.push(`Testing needs at least ${MIN_LABS_FOR_TESTING} labs that have accepted; ${facts.acceptedLabs} have.`);
    }
  }
  if (to === "testing" && facts.acceptedLabs < RECOMMENDED_MIN_LABS && problems.length === 0) {
    warnings.push(
      `Fewer than ${RECOMMENDED_MIN_LABS} labs (${facts.acceptedLabs} accepted): the usual minimum for a precision statement is ${RECOMMENDED_MIN_LABS}.`,
    );
  }
  return { allowed: problems.length === 0, problems, warnings };
}

export function moveOwner(from: StudyState, to: StudyState): MoveOwner | null {
  return NEXT[from][to] ?? null;
}
