import type { ReactNode } from "react";
import { StateBadge } from "~/components/state-badge";
import { type ObjectionStage, OBJECTION_STAGE_TEXT } from "~/lib/review/publication";
import { VOTE_CHOICE } from "~/lib/state-labels";

type Ruling = "upheld" | "not_upheld";

export type VoteRecord = {
  reviewer: string;
  choice: keyof typeof VOTE_CHOICE;
  reason: string | null;
  answer: Ruling | null;
  answerRationale: string | null;
  objectorReply: "withdrawn" | "maintained" | null;
  objectorReplyNote: string | null;
  ruling: Ruling | null;
  rulingReason: string | null;
  stage: ObjectionStage | null;
};

const rulingWords = (ruling: Ruling) => (ruling === "upheld" ? "upheld" : "not upheld");

/** One vote and what became of it: the coordinator's answer, the objector's reply, the chair's ruling, where it stands. */
export function VoteTrail({ vote, answerLabel }: { vote: VoteRecord; answerLabel: string }) {
  return (
    <>
      <p>
        <strong>{vote.reviewer}</strong>: <StateBadge view={VOTE_CHOICE[vote.choice]} />
        {vote.reason && <> — “{vote.reason}”</>}
      </p>
      {vote.answer && (
        <p className="mt-1">
          {answerLabel}: <strong>{rulingWords(vote.answer)}</strong> — {vote.answerRationale}
        </p>
      )}
      {vote.objectorReply && (
        <p className="mt-1">
          {vote.reviewer} {vote.objectorReply === "withdrawn" ? "withdrew" : "maintains"} the objection
          {vote.objectorReplyNote && <> — “{vote.objectorReplyNote}”</>}
        </p>
      )}
      {vote.ruling && (
        <p className="mt-1">
          Chair's ruling: <strong>{rulingWords(vote.ruling)}</strong> — {vote.rulingReason}
        </p>
      )}
      {vote.stage && <p className="mt-1 text-sm text-basalt-700">{OBJECTION_STAGE_TEXT[vote.stage]}</p>}
    </>
  );
}

/** The votes of a round, each with its trail and, where the reader may act on it, the form `actionFor` gives. */
export function VoteList<Vote extends VoteRecord & { id: number }>({
  votes,
  answerLabel,
  actionFor,
}: {
  votes: Vote[];
  answerLabel: string;
  actionFor: (vote: Vote) => ReactNode;
}) {
  if (votes.length === 0) return <p>No vote yet.</p>;
  return (
    <ul className="flex flex-col gap-3">
      {votes.map((v) => (
        <li key={v.id} className="rounded border border-basalt-100 p-3">
          <VoteTrail vote={v} answerLabel={answerLabel} />
          {actionFor(v)}
        </li>
      ))}
    </ul>
  );
}
