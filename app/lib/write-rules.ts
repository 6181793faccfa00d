/**
 * What may change in each study state: one table for every kind of write,
 * read by the server before each write (pages, API and import alike) and by
 * the pages, which show the same sentence beside a disabled control.
 * Published and cancelled studies are read-only everywhere. Proficiency
 * rounds and ruggedness studies are studies too: the shared kinds govern
 * their setup, labs and results pages, and their own kinds are below.
 */
import type { StudyState } from "~/db/values";

export type WriteKind =
  | "details"
  | "design"
  | "analysisSettings"
  | "protocol"
  | "coordinators"
  | "reviewers"
  | "invitations"
  | "withdrawals"
  | "shipments"
  | "receipts"
  | "results"
  | "corrections"
  | "queries"
  | "queryAnswers"
  | "decisions"
  | "statements"
  | "review"
  | "roundChoices"
  | "roundChecks"
  | "labUncertainty"
  | "roundPublication"
  | "ruggednessDesign"
  | "ruggednessResults";

type Rule = {
  /** What the write is, for the table the pages show. */
  what: string;
  open: readonly StudyState[];
  /** Shown when the study is in another (not final) state. */
  closed: string;
  /** Said instead of READ_ONLY_SENTENCE where the write belongs to a round. */
  final?: Partial<Record<StudyState, string>>;
};

const BEFORE_REVIEW: StudyState[] = ["draft", "recruiting", "testing", "checking"];

const ROUND_BEFORE_PUBLICATION = "A round's choices and checks change only until it is published.";

const ROUND_FINAL: Partial<Record<StudyState, string>> = {
  published: "This round is published; its report, scores and letters are read-only.",
  cancelled: "This round was cancelled; nothing more can be changed.",
};

export const WRITE_RULES: Record<WriteKind, Rule> = {
  details: { what: "Title, code, test method, dates and notes", open: BEFORE_REVIEW, closed: "Study details are fixed once the statement goes to the committee." },
  design: { what: "Replicates per cell, responses, materials, fresh-property targets", open: ["draft", "recruiting"], closed: "Replicates, responses and materials are fixed once testing starts." },
  analysisSettings: { what: "Significance level of the h and k flags", open: BEFORE_REVIEW, closed: "The significance level is fixed once the statement goes to the committee." },
  protocol: { what: "Protocol document", open: ["draft", "recruiting"], closed: "The protocol is fixed once testing starts; labs test to the version they received." },
  coordinators: { what: "Co-coordinators", open: ["draft", "recruiting", "testing", "checking", "in_review"], closed: "" },
  reviewers: { what: "Committee reviewers", open: BEFORE_REVIEW, closed: "The committee of a round is fixed while the statement is in review." },
  invitations: { what: "Invitations to labs", open: ["recruiting"], closed: "Labs can be invited only while the study is recruiting." },
  withdrawals: { what: "Withdrawing a lab", open: ["recruiting", "testing", "checking"], closed: "A lab can be withdrawn only while the study is recruiting, testing or being checked." },
  shipments: { what: "Shipments of materials", open: ["recruiting", "testing"], closed: "Shipments are prepared and sent only while the study is recruiting or testing." },
  receipts: { what: "Receipts of materials", open: ["recruiting", "testing"], closed: "Receipts are confirmed or corrected only while the study is recruiting or testing." },
  results: { what: "Draft results, fresh properties, import, submission", open: ["testing"], closed: "Results can be entered only while the study is testing." },
  corrections: { what: "Amendments of submitted results and fresh properties", open: ["testing", "checking"], closed: "Submitted results can be amended only while the study is testing, or checking with a correction query open." },
  queries: { what: "Raising and closing queries", open: ["testing", "checking"], closed: "Queries can be raised or closed only while the study is testing or checking data." },
  queryAnswers: { what: "Answers to queries", open: ["testing", "checking"], closed: "Queries are answered only while the study is testing or checking data." },
  decisions: { what: "Cell decisions", open: ["checking"], closed: "Cell decisions can be made only while the study is checking data." },
  statements: { what: "Freezing, editing and sending a statement", open: ["checking"], closed: "A statement can be frozen, edited or sent only while the study is checking data." },
  review: { what: "Votes, comments, answers, replies, rulings, publication", open: ["in_review"], closed: "The committee review is not open for this study." },
  roundChoices: { what: "A round's assigned values and σ_pt, and their basis", open: BEFORE_REVIEW, closed: ROUND_BEFORE_PUBLICATION, final: ROUND_FINAL },
  roundChecks: { what: "A round's homogeneity and stability results and their justification", open: BEFORE_REVIEW, closed: ROUND_BEFORE_PUBLICATION, final: ROUND_FINAL },
  labUncertainty: { what: "A lab's own standard uncertainty in a round", open: ["testing"], closed: "Uncertainties can be entered only while the round is testing.", final: ROUND_FINAL },
  roundPublication: { what: "Publishing a round's scores and letters", open: ["checking"], closed: "A round publishes from the checking state: close testing first.", final: ROUND_FINAL },
  ruggednessDesign: { what: "A ruggedness study's factors and run design", open: ["draft"], closed: "The factors and the design are fixed once results are entered." },
  ruggednessResults: { what: "A ruggedness study's results", open: ["draft", "testing"], closed: "Results are entered only while the study is being run." },
};

export const READ_ONLY_SENTENCE: Partial<Record<StudyState, string>> = {
  published: "This study is published; its record is read-only.",
  cancelled: "This study was cancelled; nothing more can be changed.",
};

/** The sentence to show when `kind` of write is refused in `state`, or null when it is allowed. */
export function writeRefusal(kind: WriteKind, state: StudyState): string | null {
  const rule = WRITE_RULES[kind];
  const final = rule.final?.[state] ?? READ_ONLY_SENTENCE[state];
  if (final) return final;
  return rule.open.includes(state) ? null : rule.closed;
}

export const mayWrite = (kind: WriteKind, state: StudyState) => writeRefusal(kind, state) === null;

/** Enrollment: only a lab still in the study writes. */
export function enrollmentRefusal(state: "invited" | "accepted" | "declined" | "withdrawn"): string | null {
  if (state === "accepted") return null;
  if (state === "withdrawn") return "Your lab was withdrawn from this study; its records can no longer change.";
  return "Your lab has not accepted this study.";
}
