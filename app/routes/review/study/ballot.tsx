import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/ballot";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { fieldProps, FormErrors, formWideErrors, replyAbout, useSchemaForm } from "~/components/forms";
import { PrecisionTables } from "~/components/precision-tables";
import { StateBadge } from "~/components/state-badge";
import { ExcludedCells, StatementCaution, StatementTexts } from "~/components/statement-parts";
import { VoteTrail } from "~/components/vote-trail";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, TextAreaField } from "~/components/ui";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { formatDateTime } from "~/lib/format";
import { OBJECTION_STAGE_TEXT, QUORUM_SENTENCE } from "~/lib/review/publication";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";
import { STATEMENT_STATE, VOTE_CHOICE } from "~/lib/state-labels";
import { studyAnalysis } from "~/models/analysis.server";
import { amendedAfterQueryCells } from "~/models/decisions.server";
import { AmendedCellsNote } from "~/components/amended-badge";
import { addComment, castVote, commentsOn, replyToAnswer, ReviewError, ruleOnObjection } from "~/models/review.server";
import { listStatements, publicationStatus, reviewersByName, studyDesign, votesOn } from "~/models/statement.server";
import { refuse } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Review" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Review", matches);
export async function loader({ context }: Route.LoaderArgs) {
  const { study, user } = requireStudy(context, ["reviewer"]);
  // The committee sees only versions that were sent to it, never a coordinator's draft.
  const statement = (await listStatements(study.id)).find((s) => s.sentAt !== null) ?? null;
  const [roundVotes, comments] = statement ? await Promise.all([votesOn(statement.id), commentsOn(statement.id)]) : [[], []];
  const publication = await publicationStatus(study.id);
  const isChair = publication.round?.chairId === user.id;
  const own = roundVotes.find((v) => v.reviewerId === user.id) ?? null;
  // Before a version is sent, the committee can follow the blinded figures as they stand.
  const current = statement
    ? null
    : {
        analysis: await studyAnalysis(study),
        responses: (await studyDesign(study.id)).responses,
      };
  return {
    current,
    amendedCells: await amendedAfterQueryCells(study.id),
    study: {
      id: study.id,
      code: study.code,
      title: study.title,
      testMethod: study.testMethod,
      state: study.state,
    },
    statement: statement && {
      version: statement.version,
      state: statement.state,
      textE691: statement.textE691,
      textC670: statement.textC670,
      snapshot: statement.snapshot,
    },
    votes: roundVotes.map(({ reviewerId, ...v }) => ({ ...v, ruleable: isChair && reviewerId !== user.id && v.stage === "awaiting_ruling" })),
    own: own && { choice: own.choice, reason: own.reason, stage: own.stage, answerRationale: own.answerRationale },
    round: publication.round && {
      chair: (await reviewersByName(study.id)).find((r) => r.id === publication.round!.chairId)?.name ?? null,
      isChair,
      reviewers: publication.round.reviewerIds.length,
    },
    tally: publication.check.tally,
    comments,
    refusal: statement?.state === "in_review" ? writeRefusal("review", study.state) : "The round is closed.",
  };
}

const voteSchema = z
  .object({
    intent: z.literal("vote"),
    choice: z.enum(["approve", "object", "abstain"], {
      message: "Choose approve, object or abstain.",
    }),
    reason: z.string().trim().max(4000, "Keep the reason under 4000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })).optional(),
  })
  .refine((v) => v.choice !== "object" || (v.reason ?? "").length >= 10, {
    path: ["reason"],
    message: "An objection needs its reason (at least 10 characters).",
  });

const replySchema = z
  .object({
    intent: z.literal("reply"),
    reply: z.enum(["withdrawn", "maintained"], { message: "Choose withdraw or maintain." }),
    note: z.string().trim().max(4000, "Keep the note under 4000 characters.").optional(),
  })
  .refine((v) => v.reply !== "maintained" || (v.note ?? "").length >= 10, { path: ["note"], message: "Say why you maintain the objection (at least 10 characters)." });

const RULING_REASON_TOO_SHORT = "Give the reason for the ruling (at least 10 characters).";
const rulingSchema = z.object({
  intent: z.literal("rule"),
  voteId: z.coerce.number({ message: "Missing id." }).int().positive("Missing id."),
  ruling: z.enum(["upheld", "not_upheld"], { message: "Choose upheld or not upheld." }),
  reason: z.string({ message: RULING_REASON_TOO_SHORT }).trim().min(10, RULING_REASON_TOO_SHORT).max(4000, "Keep the reason under 4000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })),
});

const commentSchema = z.object({
  intent: z.literal("comment"),
  body: z.string({ message: "Write the comment." }).trim().min(2, "Write the comment.").max(4000, "Keep the comment under 4000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })),
});

const ballotSchema = z.discriminatedUnion("intent", [voteSchema, replySchema, rulingSchema, commentSchema]);

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["reviewer"]);
  const submission = parseWithZod(await request.formData(), {
    schema: ballotSchema,
  });
  if (submission.status !== "success") return refuse(submission);
  const input = submission.value;
  try {
    if (input.intent === "vote") {
      await castVote(study, user.id, { choice: input.choice, reason: input.reason || null }, request);
      return redirectWithToast(`/review/${study.id}`, "Your vote is recorded. You may change it until the round closes or your objection is answered.");
    }
    if (input.intent === "reply") {
      await replyToAnswer(study, user.id, { reply: input.reply, note: input.note ?? "" }, request);
      return redirectWithToast(`/review/${study.id}`, input.reply === "withdrawn" ? "Objection withdrawn." : "Objection maintained; the chair will rule on it.");
    }
    if (input.intent === "rule") {
      const { intent: _, ...ruling } = input;
      if (!(await ruleOnObjection(study, user.id, ruling, request))) return data({ result: submission.reply({ formErrors: ["That vote is not part of this round."] }) }, { status: 404 });
      return redirectWithToast(
        `/review/${study.id}`,
        input.ruling === "upheld" ? "Ruling recorded: the objection is upheld and the statement goes back to the coordinator." : "Ruling recorded: the objection is not upheld.",
      );
    }
    await addComment(study, user.id, input.body);
    return redirectWithToast(`/review/${study.id}`, "Comment added.");
  } catch (error) {
    if (error instanceof ReviewError) return data({ result: submission.reply({ formErrors: [error.message] }) }, { status: 409 });
    throw error;
  }
}

const CHOICES = [
  { value: "approve", label: "Approve" },
  { value: "object", label: "Object (give the reason)" },
  { value: "abstain", label: "Abstain" },
] as const;

export default function ReviewStudy({ loaderData, actionData }: Route.ComponentProps) {
  const { statement, current, votes, own, comments, refusal, round, tally, amendedCells } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <StatementCaution />
      {!statement ? (
        <>
          <Card title="No statement yet">
            <p>
              The coordinator has not sent a statement to the committee yet. Below are the figures as they stand now, from the submitted results and the
              coordinator's decisions so far; they may still change before a version is frozen and sent to you.
            </p>
          </Card>
          {current && (
            <>
              <Card title="Current consistency and precision charts">
                <LazyCharts analysis={current.analysis} responses={current.responses} />
              </Card>
              <Card title="Current figures">
                <PrecisionTables analysis={current.analysis} responses={current.responses} headingLevel={3} />
                <h3 className="mb-1 mt-4 font-semibold text-basalt-800">Cells amended after a correction query</h3>
                <AmendedCellsNote amended={amendedCells} />
              </Card>
            </>
          )}
        </>
      ) : (
        <>
          <Card title={`Statement version ${statement.version}`}>
            <p className="mb-3">
              <StateBadge view={STATEMENT_STATE[statement.state]} /> · {statement.snapshot.labs} labs, {statement.snapshot.materials.length} materials,{" "}
              {statement.snapshot.replicates} replicates · data version {statement.snapshot.dataVersion}
            </p>
            <StatementTexts textE691={statement.textE691} textC670={statement.textC670} />
            <h3 className="mb-1 mt-4 font-semibold text-basalt-800">Cells left out</h3>
            <ExcludedCells excluded={statement.snapshot.analysis.excluded} />
            <h3 className="mb-1 mt-4 font-semibold text-basalt-800">Cells amended after a correction query</h3>
            <AmendedCellsNote amended={amendedCells} />
          </Card>
          <Card title="Your vote">
            {own && (
              <p className="mb-3">
                You voted <strong>{VOTE_CHOICE[own.choice].label.toLowerCase()}</strong>
                {own.reason && <> — “{own.reason}”</>}.
              </p>
            )}
            {own?.stage && <p className="mb-3 text-basalt-700">Your objection: {OBJECTION_STAGE_TEXT[own.stage]}.</p>}
            {!refusal && own?.stage === "awaiting_objector" && <ReplyForm answerRationale={own.answerRationale} chair={round?.chair ?? null} actionData={actionData} />}
            {refusal ? <p>{refusal}</p> : own?.stage && own.stage !== "awaiting_answer" ? null : <VoteForm own={own} actionData={actionData} />}
          </Card>
          <Card title="Votes and answers">
            {round && (
              <p className="mb-2">
                Chair of this round: {round.chair ?? "—"}. {QUORUM_SENTENCE}
              </p>
            )}
            <p className="mb-3" data-testid="tally">
              Tally: {tally.voted} of {tally.reviewers} reviewers voted · {tally.approve} approve · {tally.object} object · {tally.abstain} abstain
            </p>
            {votes.length === 0 ? (
              <p>No vote yet.</p>
            ) : (
              <ul className="flex flex-col gap-2">
                {votes.map((v) => (
                  <li key={v.id} className="rounded border border-basalt-100 p-3">
                    <VoteTrail vote={v} answerLabel="Coordinator's answer" />
                    {v.ruleable && !refusal && <RulingForm vote={v} actionData={actionData} />}
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Card title="Comments">
            {comments.length === 0 ? (
              <p>No comment yet.</p>
            ) : (
              <ul className="mb-4 flex flex-col gap-2">
                {comments.map((c) => (
                  <li key={c.id} className="rounded border border-basalt-100 p-3">
                    <p className="text-sm text-basalt-700">
                      {c.author} · {formatDateTime(c.createdAt)}
                    </p>
                    <p className="whitespace-pre-line">{c.body}</p>
                  </li>
                ))}
              </ul>
            )}
            {/* Keyed by the number of comments, so the box is empty again once a comment is added. */}
            {!refusal && <CommentForm key={comments.length} actionData={actionData} />}
          </Card>
          <Card title="Charts">
            <LazyCharts analysis={statement.snapshot.analysis} responses={statement.snapshot.responses} />
          </Card>
          <Card title="Tables">
            <PrecisionTables analysis={statement.snapshot.analysis} responses={statement.snapshot.responses} headingLevel={3} />
          </Card>
        </>
      )}
    </div>
  );
}

type ActionData = Route.ComponentProps["actionData"];

function VoteForm({
  own,
  actionData,
}: {
  own: {
    choice: "approve" | "object" | "abstain";
    reason: string | null;
  } | null;
  actionData: ActionData;
}) {
  const [form, fields] = useSchemaForm(voteSchema, {
    reply: actionData,
    intent: "vote",
    defaultValue: { choice: own?.choice, reason: own?.reason ?? "" },
  });
  const choiceError = fields.choice.errors?.[0];
  return (
    <Form method="post" className="flex flex-col gap-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="vote" />
      <FormErrors errors={formWideErrors(form)} />
      <fieldset aria-describedby={choiceError ? `${fields.choice.id}-error` : undefined}>
        <legend className="mb-1 font-semibold text-basalt-800">{own ? "Change your vote" : "Your vote"}</legend>
        <div className="flex flex-wrap gap-4">
          {CHOICES.map((c) => (
            <label key={c.value} className="inline-flex min-h-11 items-center gap-2">
              <input type="radio" name={fields.choice.name} value={c.value} defaultChecked={fields.choice.initialValue === c.value} className="size-5" />
              {c.label}
            </label>
          ))}
        </div>
        {choiceError && (
          <p id={`${fields.choice.id}-error`} className="text-sm font-semibold text-signal-700">
            {choiceError}
          </p>
        )}
      </fieldset>
      <TextAreaField label="Reason" hint="Required when you object." {...fieldProps(fields.reason)} />
      <div>
        <Button type="submit">Record my vote</Button>
      </div>
    </Form>
  );
}

/** The objector's reply to a "not upheld" answer: withdraw, or maintain it for the chair's ruling. */
function ReplyForm({ answerRationale, chair, actionData }: { answerRationale: string | null; chair: string | null; actionData: ActionData }) {
  const [form, fields] = useSchemaForm(replySchema, { reply: actionData, intent: "reply" });
  const replyError = fields.reply.errors?.[0];
  return (
    <Form method="post" className="mb-4 flex flex-col gap-3 rounded border border-ochre-300 p-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="reply" />
      <FormErrors errors={formWideErrors(form)} />
      <p>
        The coordinator answered your objection <strong>not upheld</strong>: “{answerRationale}”. Withdraw the objection, or maintain it and the chair
        {chair ? ` (${chair})` : ""} will rule on it.
      </p>
      <fieldset aria-describedby={replyError ? fields.reply.errorId : undefined}>
        <legend className="font-semibold text-basalt-800">Your reply</legend>
        <div className="flex flex-wrap gap-4">
          <label className="inline-flex min-h-11 items-center gap-2">
            <input type="radio" name={fields.reply.name} value="withdrawn" className="size-5" defaultChecked={fields.reply.initialValue === "withdrawn"} /> Withdraw my objection
          </label>
          <label className="inline-flex min-h-11 items-center gap-2">
            <input type="radio" name={fields.reply.name} value="maintained" className="size-5" defaultChecked={fields.reply.initialValue === "maintained"} /> Maintain it
          </label>
        </div>
        {replyError && (
          <p id={fields.reply.errorId} className="text-sm font-semibold text-signal-700">
            {replyError}
          </p>
        )}
      </fieldset>
      <TextAreaField label="Note" hint="Required when you maintain the objection." {...fieldProps(fields.note)} />
      <div>
        <Button type="submit">Send my reply</Button>
      </div>
    </Form>
  );
}

type RoundVote = Route.ComponentProps["loaderData"]["votes"][number];

/** The chair's ruling on one maintained objection; the action's answer belongs to it only when it names this vote. */
function RulingForm({ vote, actionData }: { vote: RoundVote; actionData: ActionData }) {
  const [form, fields] = useSchemaForm(rulingSchema, { reply: replyAbout(actionData, "voteId", vote.id), intent: "rule", id: `ruling-${vote.id}` });
  const rulingError = fields.ruling.errors?.[0];
  return (
    <Form method="post" className="mt-3 flex flex-col gap-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="rule" />
      <input type="hidden" name="voteId" value={vote.id} />
      <FormErrors errors={formWideErrors(form)} />
      <fieldset aria-describedby={rulingError ? fields.ruling.errorId : undefined}>
        <legend className="font-semibold text-basalt-800">Your ruling as chair on {vote.reviewer}'s maintained objection</legend>
        <div className="flex flex-wrap gap-4">
          <label className="inline-flex min-h-11 items-center gap-2">
            <input type="radio" name={fields.ruling.name} value="upheld" className="size-5" defaultChecked={fields.ruling.initialValue === "upheld"} /> Upheld (the statement goes back for revision)
          </label>
          <label className="inline-flex min-h-11 items-center gap-2">
            <input type="radio" name={fields.ruling.name} value="not_upheld" className="size-5" defaultChecked={fields.ruling.initialValue === "not_upheld"} /> Not upheld
          </label>
        </div>
        {rulingError && (
          <p id={fields.ruling.errorId} className="text-sm font-semibold text-signal-700">
            {rulingError}
          </p>
        )}
      </fieldset>
      <TextAreaField label="Reason for the ruling (recorded and shown to the committee)" {...fieldProps(fields.reason)} />
      <div>
        <Button type="submit">Record the ruling</Button>
      </div>
    </Form>
  );
}

function CommentForm({ actionData }: { actionData: ActionData }) {
  const [form, fields] = useSchemaForm(commentSchema, {
    reply: actionData,
    intent: "comment",
  });
  return (
    <Form method="post" className="flex flex-col gap-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="comment" />
      <FormErrors errors={formWideErrors(form)} />
      <TextAreaField label="Add a comment" {...fieldProps(fields.body)} />
      <div>
        <Button type="submit" variant="secondary">
          Add the comment
        </Button>
      </div>
    </Form>
  );
}
