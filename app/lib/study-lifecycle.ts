/**
 * Which study state may follow which, and what each move needs. Pure rules:
 * the model module gathers the facts from the database and applies them.
 */
import type { StudyState } from "~/db/schema";

/** At least this many accepted labs before testing can start. */
export const MIN_LABS_FOR_TESTING = 3;
/** Below this many labs a precision statement is usually not written (common practice: E691 asks for at least 6). */
export const RECOMMENDED_MIN_LABS = 6;

const NEXT: Record<StudyState, StudyState[]> = {
  draft: ["recruiting", "cancelled"],
  recruiting: ["draft", "testing", "cancelled"],
  // Checking can send the study back to testing, so labs may amend after a query.
  testing: ["checking", "cancelled"],
  checking: ["testing", "in_review", "cancelled"],
  in_review: ["checking", "published", "cancelled"],
  published: [],
  cancelled: [],
};

export function allowedNextStates(from: StudyState): StudyState[] {
  return NEXT[from];
}

/** What the rules need to know about the study. */
export type TransitionFacts = { materials: number; acceptedLabs: number };

export type TransitionCheck = { allowed: boolean; problems: string[]; warnings: string[] };

export function checkTransition(from: StudyState, to: StudyState, facts: TransitionFacts): TransitionCheck {
  const problems: string[] = [];
  const warnings: string[] = [];
  if (!NEXT[from].includes(to)) {
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

/** Labs enter and change results only while the study is testing. */
export function resultsEditable(state: StudyState) {
  return state === "testing";
}

/** Setup (responses, materials, mixture designs) may change until testing starts. */
export function setupEditable(state: StudyState) {
  return state === "draft" || state === "recruiting";
}

/** Labs are invited while the study is recruiting. */
export function invitationsOpen(state: StudyState) {
  return state === "recruiting";
}
