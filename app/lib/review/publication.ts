/** When a precision statement in review may be published: the committee's rule, kept pure. */
import type { VOTE_CHOICES } from "~/db/schema";

export type VoteChoice = (typeof VOTE_CHOICES)[number];

export type VoteFacts = {
  reviewerId: number;
  choice: VoteChoice;
  answer: "upheld" | "not_upheld" | null;
};

export type PublicationCheck = { allowed: boolean; problems: string[]; awaited: number[] };

/**
 * Every assigned reviewer must have voted (abstaining counts as a vote), and
 * every objection must have an answer. An upheld objection sends the
 * statement back, so it can never be published as it stands.
 */
export function publicationCheck(reviewerIds: readonly number[], votes: readonly VoteFacts[]): PublicationCheck {
  const problems: string[] = [];
  const voted = new Set(votes.map((v) => v.reviewerId));
  const awaited = reviewerIds.filter((id) => !voted.has(id));
  if (reviewerIds.length === 0) problems.push("No reviewer is assigned to this study.");
  if (awaited.length > 0) problems.push(`${awaited.length} of ${reviewerIds.length} reviewers have not voted yet.`);
  const objections = votes.filter((v) => v.choice === "object" && reviewerIds.includes(v.reviewerId));
  const unanswered = objections.filter((v) => v.answer === null).length;
  if (unanswered > 0) problems.push(`${unanswered} ${unanswered === 1 ? "objection has" : "objections have"} no answer yet.`);
  if (objections.some((v) => v.answer === "upheld")) problems.push("An objection was upheld: revise the statement and start a new round.");
  return { allowed: problems.length === 0, problems, awaited };
}
