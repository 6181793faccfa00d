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

/** One table of views from `state: [label, tone]` pairs, so each vocabulary reads on one line. */
function views<K extends string>(table: Record<K, readonly [label: string, tone: Tone]>): Record<K, StateView> {
  return Object.fromEntries(Object.entries<readonly [string, Tone]>(table).map(([key, [label, tone]]) => [key, { label, tone }])) as Record<K, StateView>;
}

export const STUDY_STATE = views<StudyState>({
  draft: ["Draft", "neutral"], recruiting: ["Recruiting labs", "ochre"], testing: ["Testing", "ochre"], checking: ["Checking data", "ochre"],
  in_review: ["In committee review", "ochre"], published: ["Published", "leaf"], cancelled: ["Cancelled", "neutral"],
});
export const ENROLLMENT_STATE = views({ invited: ["Invited", "ochre"], accepted: ["Accepted", "leaf"], declined: ["Declined", "neutral"], withdrawn: ["Withdrawn", "signal"] });
export const SHIPMENT_STATE = views({ preparing: ["Being prepared", "neutral"], shipped: ["On its way", "ochre"], received: ["Received", "leaf"], lost: ["Lost in transit", "signal"] });
export const QUERY_STATE = views({ open: ["Open", "signal"], answered: ["Answered", "ochre"], closed: ["Closed", "neutral"] });
export const STATEMENT_STATE = views({ draft: ["Draft", "neutral"], in_review: ["In review", "ochre"], approved: ["Approved", "leaf"], returned: ["Returned", "signal"] });
export const VOTE_CHOICE = views({ approve: ["Approve", "leaf"], object: ["Object", "signal"], abstain: ["Abstain", "neutral"] });
export const CELL_STATUS = views<CellStatus>({
  not_started: ["Not started", "neutral"], draft: ["Draft", "ochre"], submitted: ["Submitted", "leaf"], amended: ["Amended", "leaf"], queried: ["Queried", "signal"],
});
export const CELL_DECISION = views({ retained: ["Retained", "leaf"], excluded: ["Excluded", "signal"] });

/** Kept for the many places that only need a study state's words. */
export const STATE_LABEL = Object.fromEntries(Object.entries(STUDY_STATE).map(([state, v]) => [state, v.label])) as Record<StudyState, string>;
