/**
 * The committee's rules for a round, kept pure: where each objection stands,
 * the tally, and whether the statement may be published.
 *
 * An objection needs the coordinator's written answer. "Upheld" returns the
 * statement. "Not upheld" goes back to the objector, who withdraws it or
 * maintains it; a maintained objection goes to the round's chair, who rules
 * with a reason. The chair does not rule on their own objection: it can only
 * be answered by revising the statement.
 */
import type { VOTE_CHOICES } from "~/db/values";

export type VoteChoice = (typeof VOTE_CHOICES)[number];

export type VoteFacts = {
  reviewerId: number;
  choice: VoteChoice;
  answer: "upheld" | "not_upheld" | null;
  objectorReply?: "withdrawn" | "maintained" | null;
  ruling?: "upheld" | "not_upheld" | null;
};

export type ObjectionStage = "awaiting_answer" | "awaiting_objector" | "awaiting_ruling" | "withdrawn" | "overruled" | "upheld";

/** Where one objection stands; null for a vote that is not an objection. */
export function objectionStage(vote: VoteFacts): ObjectionStage | null {
  if (vote.choice !== "object") return null;
  if (vote.answer === null) return "awaiting_answer";
  if (vote.answer === "upheld") return "upheld";
  if (!vote.objectorReply) return "awaiting_objector";
  if (vote.objectorReply === "withdrawn") return "withdrawn";
  if (!vote.ruling) return "awaiting_ruling";
  return vote.ruling === "upheld" ? "upheld" : "overruled";
}

export const OBJECTION_STAGE_TEXT: Record<ObjectionStage, string> = {
  awaiting_answer: "Awaiting the coordinator's answer",
  awaiting_objector: "Answered “not upheld”; awaiting the reviewer's reply",
  awaiting_ruling: "Maintained; awaiting the chair's ruling",
  withdrawn: "Withdrawn by the reviewer",
  overruled: "Maintained, then ruled not upheld by the chair",
  upheld: "Upheld: the statement must be revised",
};

/** Quorum: every reviewer of the round has voted, and at least two-thirds of the votes other than abstentions approve. */
export const QUORUM_SENTENCE =
  "Publication needs a vote from every reviewer of the round, approval by at least two-thirds of the votes cast (abstentions not counted), and no objection left unresolved.";

export type Tally = { reviewers: number; voted: number; approve: number; object: number; abstain: number; withdrawn: number };

export type PublicationCheck = { allowed: boolean; problems: string[]; awaited: number[]; tally: Tally };

export function publicationCheck(roundReviewerIds: readonly number[], votes: readonly VoteFacts[]): PublicationCheck {
  const problems: string[] = [];
  const ours = votes.filter((v) => roundReviewerIds.includes(v.reviewerId));
  const voted = new Set(ours.map((v) => v.reviewerId));
  const awaited = roundReviewerIds.filter((id) => !voted.has(id));
  const stages = ours.map(objectionStage);
  const withdrawn = stages.filter((s) => s === "withdrawn").length;
  const tally: Tally = {
    reviewers: roundReviewerIds.length,
    voted: voted.size,
    approve: ours.filter((v) => v.choice === "approve").length,
    // A withdrawn objection no longer counts against the statement; it counts as an abstention.
    object: ours.filter((v) => v.choice === "object").length - withdrawn,
    abstain: ours.filter((v) => v.choice === "abstain").length + withdrawn,
    withdrawn,
  };
  if (roundReviewerIds.length === 0) problems.push("This round has no reviewers.");
  if (awaited.length > 0) problems.push(`${awaited.length} of ${roundReviewerIds.length} reviewers have not voted yet.`);
  const count = (stage: ObjectionStage) => stages.filter((s) => s === stage).length;
  const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  if (count("awaiting_answer") > 0) problems.push(`${plural(count("awaiting_answer"), "objection has", "objections have")} no answer yet.`);
  if (count("awaiting_objector") > 0) problems.push(`${plural(count("awaiting_objector"), "objection awaits", "objections await")} its reviewer's reply to the answer.`);
  if (count("awaiting_ruling") > 0) problems.push(`${plural(count("awaiting_ruling"), "maintained objection awaits", "maintained objections await")} the chair's ruling.`);
  if (count("upheld") > 0) problems.push("An objection was upheld: revise the statement and start a new round.");
  const cast = tally.approve + tally.object;
  if (awaited.length === 0 && roundReviewerIds.length > 0 && (cast === 0 || tally.approve * 3 < cast * 2)) {
    problems.push(`Approval falls short of two-thirds of the votes cast (${tally.approve} of ${cast}).`);
  }
  return { allowed: problems.length === 0, problems, awaited, tally };
}
