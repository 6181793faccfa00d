/**
 * How every state of the record reads on the pages, and the tone of its badge.
 * The label always says it; the tone (from the palette) only helps the eye.
 * Colours mean the same everywhere: ochre = waiting on someone, leaf = done or
 * good, signal = needs attention, neutral = not started or over.
 */
import type { CellStatus } from "~/lib/cell-status";
import type { StudyState } from "~/db/values";

export type Tone = "neutral" | "ochre" | "leaf" | "signal";
export type StateView = { label: string; tone: Tone };

const view = (label: string, tone: Tone): StateView => ({ label, tone });

export const STUDY_STATE: Record<StudyState, StateView> = {
  draft: view("Draft", "neutral"),
  recruiting: view("Recruiting labs", "ochre"),
  testing: view("Testing", "ochre"),
  checking: view("Checking data", "ochre"),
  in_review: view("In committee review", "ochre"),
  published: view("Published", "leaf"),
  cancelled: view("Cancelled", "neutral"),
};

export const ENROLLMENT_STATE = {
  invited: view("Invited", "ochre"),
  accepted: view("Accepted", "leaf"),
  declined: view("Declined", "neutral"),
  withdrawn: view("Withdrawn", "signal"),
} as const satisfies Record<string, StateView>;

export const SHIPMENT_STATE = {
  preparing: view("Being prepared", "neutral"),
  shipped: view("On its way", "ochre"),
  received: view("Received", "leaf"),
  lost: view("Lost in transit", "signal"),
} as const satisfies Record<string, StateView>;

export const QUERY_STATE = {
  open: view("Open", "signal"),
  answered: view("Answered", "ochre"),
  closed: view("Closed", "neutral"),
} as const satisfies Record<string, StateView>;

export const STATEMENT_STATE = {
  draft: view("Draft", "neutral"),
  in_review: view("In review", "ochre"),
  approved: view("Approved", "leaf"),
  returned: view("Returned", "signal"),
} as const satisfies Record<string, StateView>;

export const VOTE_CHOICE = {
  approve: view("Approve", "leaf"),
  object: view("Object", "signal"),
  abstain: view("Abstain", "neutral"),
} as const satisfies Record<string, StateView>;

export const CELL_STATUS: Record<CellStatus, StateView> = {
  not_started: view("Not started", "neutral"),
  draft: view("Draft", "ochre"),
  submitted: view("Submitted", "leaf"),
  amended: view("Amended", "leaf"),
  queried: view("Queried", "signal"),
};

export const CELL_DECISION = {
  retained: view("Retained", "leaf"),
  excluded: view("Excluded", "signal"),
} as const satisfies Record<string, StateView>;

/** Kept for the many places that only need a study state's words. */
export const STATE_LABEL = Object.fromEntries(Object.entries(STUDY_STATE).map(([state, v]) => [state, v.label])) as Record<StudyState, string>;
