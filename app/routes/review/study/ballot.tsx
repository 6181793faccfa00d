import { Form } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/ballot";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { PrecisionTables } from "~/components/precision-tables";
import { ExcludedCells, StatementCaution, StatementTexts } from "~/components/statement-parts";
import { Badge, Button, Card, Notice, PageHeader, TextAreaField } from "~/components/ui";
import { type ActionResult, refused } from "~/lib/form-results";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { requireStudy } from "~/server/study-context.server";
import { writeRefusal } from "~/lib/write-rules";
import { STATE_LABEL } from "~/lib/state-labels";
import { OBJECTION_STAGE_TEXT, QUORUM_SENTENCE } from "~/lib/review/publication";
import { addComment, castVote, commentsOn, replyToAnswer, ReviewError, ruleOnObjection } from "~/models/review.server";
import { studyAnalysis } from "~/models/analysis.server";
import { listStatements, publicationStatus, reviewersByName, studyDesign, votesOn } from "~/models/statement.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Review · ${data?.study.code ?? "Study"} · Ringbatch` }];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, user } = requireStudy(context, ["reviewer"]);
  // The committee sees only versions that were sent to it, never a coordinator's draft.
  const statement = (await listStatements(study.id)).find((s) => s.sentAt !== null) ?? null;
  const [roundVotes, comments] = statement ? await Promise.all([votesOn(statement.id), commentsOn(statement.id)]) : [[], []];
  const publication = await publicationStatus(study.id);
  const isChair = publication.round?.chairId === user.id;
  const own = roundVotes.find((v) => v.reviewerId === user.id) ?? null;
  // Before a version is sent, the committee can follow the blinded figures as they stand.
  const current = statement ? null : { analysis: await studyAnalysis(study), responses: (await studyDesign(study.id)).responses };
  return {
    current,
    study: { id: study.id, code: study.code, title: study.title, testMethod: study.testMethod, state: study.state },
    statement: statement && {
      version: statement.version,
      state: statement.state,
      textE691: statement.textE691,
      textC670: statement.textC670,
      snapshot: statement.snapshot,
    },
    votes: roundVotes.map(({ reviewerId, ...v }) => ({ ...v, ruleable: isChair && reviewerId !== user.id && v.stage === "awaiting_ruling" })),
    own: own && { choice: own.choice, reason: own.reason, stage: own.stage, answerRationale: own.answerRationale },
    round: publication.round && { chair: (await reviewersByName(study.id)).find((r) => r.id === publication.round!.chairId)?.name ?? null, isChair, reviewers: publication.round.reviewerIds.length },
    tally: publication.check.tally,
    comments,
    refusal: statement?.state === "in_review" ? writeRefusal("review", study.state) : "The round is closed.",
  };
}

const voteSchema = z
  .object({
    choice: z.enum(["approve", "object", "abstain"], { message: "Choose approve, object or abstain." }),
    reason: z.string().trim().max(4000, "Keep the reason under 4000 characters."),
  })
  .refine((v) => v.choice !== "object" || v.reason.length >= 10, { path: ["reason"], message: "An objection needs its reason (at least 10 characters)." });

const replySchema = z
  .object({
    reply: z.enum(["withdrawn", "maintained"], { message: "Choose withdraw or maintain." }),
    note: z.string().trim().max(4000, "Keep the note under 4000 characters."),
  })
  .refine((v) => v.reply !== "maintained" || v.note.length >= 10, { path: ["note"], message: "Say why you maintain the objection (at least 10 characters)." });

const rulingSchema = z.object({
  voteId: z.coerce.number({ message: "Missing id." }).int().positive("Missing id."),
  ruling: z.enum(["upheld", "not_upheld"], { message: "Choose upheld or not upheld." }),
  reason: z.string().trim().min(10, "Give the reason for the ruling (at least 10 characters).").max(4000, "Keep the reason under 4000 characters."),
});

const commentSchema = z.object({ body: z.string().trim().min(2, "Write the comment.").max(4000, "Keep the comment under 4000 characters.") });

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["reviewer"]);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  const fail = (errors: FieldErrors, values: Record<string, string>, status = 400) => refused(intent, errors, values, status);
  try {
    if (intent === "vote") {
      const parsed = parseForm(voteSchema, form);
      if (!parsed.ok) return fail(parsed.errors, parsed.values);
      await castVote(study, user.id, { choice: parsed.data.choice, reason: parsed.data.reason || null }, request);
      return { intent, done: "Your vote is recorded. You may change it until the round closes or your objection is answered." } satisfies ActionResult;
    }
    if (intent === "reply") {
      const parsed = parseForm(replySchema, form);
      if (!parsed.ok) return fail(parsed.errors, parsed.values);
      await replyToAnswer(study, user.id, parsed.data, request);
      return { intent, done: parsed.data.reply === "withdrawn" ? "Objection withdrawn." : "Objection maintained; the chair will rule on it." } satisfies ActionResult;
    }
    if (intent === "rule") {
      const parsed = parseForm(rulingSchema, form);
      if (!parsed.ok) return fail(parsed.errors, parsed.values);
      if (!(await ruleOnObjection(study, user.id, parsed.data, request))) return fail({ form: "That vote is not part of this round." }, {}, 404);
      return { intent, done: parsed.data.ruling === "upheld" ? "Ruling recorded: the objection is upheld and the statement goes back to the coordinator." : "Ruling recorded: the objection is not upheld." } satisfies ActionResult;
    }
    if (intent === "comment") {
      const parsed = parseForm(commentSchema, form);
      if (!parsed.ok) return fail(parsed.errors, parsed.values);
      await addComment(study, user.id, parsed.data.body);
      return { intent, done: "Comment added." } satisfies ActionResult;
    }
    return fail({ form: "Unknown action." }, {});
  } catch (error) {
    if (error instanceof ReviewError) return fail({ form: error.message }, {}, 409);
    throw error;
  }
}

const CHOICES = [
  { value: "approve", label: "Approve" },
  { value: "object", label: "Object (give the reason)" },
  { value: "abstain", label: "Abstain" },
] as const;

export default function ReviewStudy({ loaderData, actionData }: Route.ComponentProps) {
  const { study, statement, current, votes, own, comments, refusal, round, tally } = loaderData;
  const awaitingReply = own?.stage === "awaiting_objector";
  const outcome = actionData as ActionResult | undefined;
  const failed = outcome?.errors ? outcome : null;
  return (
    <>
      <PageHeader
        title={`Review — ${study.code}`}
        subtitle={
          <>
            {study.title} · <Badge>{STATE_LABEL[study.state]}</Badge> · labs appear by code only
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <StatementCaution />
        {outcome?.done && <Notice tone="success">{outcome.done}</Notice>}
        {failed?.errors?.form && <Notice tone="error">{failed.errors.form}</Notice>}
        {!statement ? (
          <>
            <Card title="No statement yet">
              <p>
                The coordinator has not sent a statement to the committee yet. Below are the figures as they stand now, from the submitted
                results and the coordinator's decisions so far; they may still change before a version is frozen and sent to you.
              </p>
            </Card>
            {current && (
              <>
                <Card title="Current consistency and precision charts">
                  <LazyCharts analysis={current.analysis} responses={current.responses} />
                </Card>
                <Card title="Current figures">
                  <PrecisionTables analysis={current.analysis} responses={current.responses} headingLevel={3} />
                </Card>
              </>
            )}
          </>
        ) : (
          <>
            <Card title={`Statement version ${statement.version}`}>
              <p className="mb-3">
                <Badge>{statement.state.replace("_", " ")}</Badge> · {statement.snapshot.labs} labs, {statement.snapshot.materials.length} materials,{" "}
                {statement.snapshot.replicates} replicates · data version {statement.snapshot.dataVersion}
              </p>
              <StatementTexts textE691={statement.textE691} textC670={statement.textC670} />
              <h3 className="mb-1 mt-4 font-semibold text-basalt-800">Cells left out</h3>
              <ExcludedCells excluded={statement.snapshot.analysis.excluded} />
            </Card>
            <Card title="Your vote">
              {own && (
                <p className="mb-3">
                  You voted <strong>{own.choice}</strong>
                  {own.reason && <> — “{own.reason}”</>}.
                </p>
              )}
              {own?.stage && <p className="mb-3 text-basalt-700">Your objection: {OBJECTION_STAGE_TEXT[own.stage]}.</p>}
              {!refusal && awaitingReply && (
                <Form method="post" className="mb-4 flex flex-col gap-3 rounded border border-ochre-300 p-3">
                  <input type="hidden" name="intent" value="reply" />
                  <p>
                    The coordinator answered your objection <strong>not upheld</strong>: “{own?.answerRationale}”. Withdraw the objection, or maintain it
                    and the chair{round?.chair ? ` (${round.chair})` : ""} will rule on it.
                  </p>
                  <fieldset>
                    <legend className="font-semibold text-basalt-800">Your reply</legend>
                    <div className="flex flex-wrap gap-4">
                      <label className="inline-flex min-h-11 items-center gap-2">
                        <input type="radio" name="reply" value="withdrawn" className="size-5" defaultChecked={failed?.values?.reply === "withdrawn"} /> Withdraw my objection
                      </label>
                      <label className="inline-flex min-h-11 items-center gap-2">
                        <input type="radio" name="reply" value="maintained" className="size-5" defaultChecked={failed?.values?.reply === "maintained"} /> Maintain it
                      </label>
                    </div>
                    {failed?.intent === "reply" && failed.errors?.reply && <p className="text-sm font-semibold text-signal-700">{failed.errors.reply}</p>}
                  </fieldset>
                  <TextAreaField name="note" label="Note" hint="Required when you maintain the objection." error={failed?.intent === "reply" ? failed.errors?.note : undefined} defaultValue={failed?.intent === "reply" ? failed.values?.note : ""} />
                  <div>
                    <Button type="submit">Send my reply</Button>
                  </div>
                </Form>
              )}
              {refusal ? (
                <p>{refusal}</p>
              ) : own?.stage && own.stage !== "awaiting_answer" ? null : (
                <Form method="post" className="flex flex-col gap-3">
                  <input type="hidden" name="intent" value="vote" />
                  <fieldset aria-describedby={failed?.errors?.choice ? "field-choice-error" : undefined}>
                    <legend className="mb-1 font-semibold text-basalt-800">{own ? "Change your vote" : "Your vote"}</legend>
                    <div className="flex flex-wrap gap-4">
                      {CHOICES.map((c) => (
                        <label key={c.value} className="inline-flex min-h-11 items-center gap-2">
                          <input type="radio" name="choice" value={c.value} defaultChecked={(failed?.values?.choice ?? own?.choice) === c.value} className="size-5" />
                          {c.label}
                        </label>
                      ))}
                    </div>
                    {failed?.errors?.choice && (
                      <p id="field-choice-error" className="text-sm font-semibold text-signal-700">
                        {failed.errors.choice}
                      </p>
                    )}
                  </fieldset>
                  <TextAreaField name="reason" label="Reason" hint="Required when you object." error={failed?.intent === "vote" ? failed.errors?.reason : undefined} defaultValue={failed?.values?.reason ?? own?.reason ?? ""} />
                  <div>
                    <Button type="submit">Record my vote</Button>
                  </div>
                </Form>
              )}
            </Card>
            <Card title="Votes and answers">
              {round && <p className="mb-2">Chair of this round: {round.chair ?? "—"}. {QUORUM_SENTENCE}</p>}
              <p className="mb-3" data-testid="tally">
                Tally: {tally.voted} of {tally.reviewers} reviewers voted · {tally.approve} approve · {tally.object} object · {tally.abstain} abstain
              </p>
              {votes.length === 0 ? (
                <p>No vote yet.</p>
              ) : (
                <ul className="flex flex-col gap-2">
                  {votes.map((v) => (
                    <li key={v.id} className="rounded border border-basalt-100 p-3">
                      <strong>{v.reviewer}</strong>: {v.choice}
                      {v.reason && <> — “{v.reason}”</>}
                      {v.answer && (
                        <p className="mt-1">
                          Coordinator's answer: <strong>{v.answer === "upheld" ? "upheld" : "not upheld"}</strong> — {v.answerRationale}
                        </p>
                      )}
                      {v.objectorReply && (
                        <p className="mt-1">
                          {v.reviewer} {v.objectorReply === "withdrawn" ? "withdrew" : "maintains"} the objection{v.objectorReplyNote && <> — “{v.objectorReplyNote}”</>}
                        </p>
                      )}
                      {v.ruling && (
                        <p className="mt-1">
                          Chair's ruling: <strong>{v.ruling === "upheld" ? "upheld" : "not upheld"}</strong> — {v.rulingReason}
                        </p>
                      )}
                      {v.stage && <p className="mt-1 text-sm text-basalt-700">{OBJECTION_STAGE_TEXT[v.stage]}</p>}
                      {v.ruleable && !refusal && (
                        <Form method="post" className="mt-3 flex flex-col gap-3">
                          <input type="hidden" name="intent" value="rule" />
                          <input type="hidden" name="voteId" value={v.id} />
                          <fieldset>
                            <legend className="font-semibold text-basalt-800">Your ruling as chair on {v.reviewer}'s maintained objection</legend>
                            <div className="flex flex-wrap gap-4">
                              <label className="inline-flex min-h-11 items-center gap-2">
                                <input type="radio" name="ruling" value="upheld" className="size-5" /> Upheld (the statement goes back for revision)
                              </label>
                              <label className="inline-flex min-h-11 items-center gap-2">
                                <input type="radio" name="ruling" value="not_upheld" className="size-5" /> Not upheld
                              </label>
                            </div>
                            {failed?.values?.voteId === String(v.id) && failed.errors?.ruling && <p className="text-sm font-semibold text-signal-700">{failed.errors.ruling}</p>}
                          </fieldset>
                          <TextAreaField
                            name="reason"
                            id={`ruling-reason-${v.id}`}
                            label="Reason for the ruling (recorded and shown to the committee)"
                            error={failed?.intent === "rule" && failed.values?.voteId === String(v.id) ? failed.errors?.reason : undefined}
                            defaultValue={failed?.values?.voteId === String(v.id) ? failed.values.reason : ""}
                          />
                          <div>
                            <Button type="submit">Record the ruling</Button>
                          </div>
                        </Form>
                      )}
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
                        {c.author} · {c.createdAt.slice(0, 16).replace("T", " ")}
                      </p>
                      <p className="whitespace-pre-line">{c.body}</p>
                    </li>
                  ))}
                </ul>
              )}
              {!refusal && (
                <Form method="post" className="flex flex-col gap-3">
                  <input type="hidden" name="intent" value="comment" />
                  <TextAreaField name="body" label="Add a comment" error={failed?.errors?.body} defaultValue={failed?.intent === "comment" ? failed.values?.body : ""} />
                  <div>
                    <Button type="submit" variant="secondary">
                      Add the comment
                    </Button>
                  </div>
                </Form>
              )}
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
    </>
  );
}
