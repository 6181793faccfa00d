import { parseWithZod } from "@conform-to/zod/v4";
import { data } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/ballot";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { fieldProps, PostForm, replyAbout, useSchemaForm } from "~/components/forms";
import { PrecisionSummaryTable } from "~/components/precision-tables";
import { MaterialPicker } from "~/components/material-picker";
import { DecisionsOnRecord, MaterialEvidence } from "~/components/review-evidence";
import { StudyDownloads } from "~/components/study-downloads";
import { StateBadge } from "~/components/state-badge";
import { StatementCaution, StatementTexts } from "~/components/statement-parts";
import { VoteList } from "~/components/vote-trail";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, RadioField, TextAreaField } from "~/components/ui";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { countOf, formatDate, formatDateTime } from "~/lib/format";
import { withheldIdentities } from "~/lib/blinding";
import { blindedQueries, materialRecord } from "~/lib/review/evidence";
import { OBJECTION_STAGE_TEXT, publicationCheck, QUORUM_SENTENCE } from "~/lib/review/publication";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";
import { STATEMENT_STATE, VOTE_CHOICE } from "~/lib/state-labels";
import { studyAnalysis } from "~/models/analysis.server";
import { AmendedCellsNote } from "~/components/amended-badge";
import { addComment, castVote, commentsOn, replyToAnswer, ReviewError, ruleOnObjection } from "~/models/review.server";
import { studyIdentities } from "~/models/blinding.server";
import { listStudyQueries } from "~/models/coordinator-queries.server";
import { amendedAfterQueryCells, listCellDecisions, submittedResultsOfMaterial } from "~/models/decisions.server";
import { listStatements, publicationStatus, reviewersByName, studyDesign, votesOn } from "~/models/statement.server";
import { refuse } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Review" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Review", matches);
export async function loader({ request, context }: Route.LoaderArgs) {
  const { study, user } = requireStudy(context, ["reviewer"]);
  // The committee sees only versions that were sent to it, never a coordinator's draft.
  const statement = (await listStatements(study.id)).find((s) => s.sentAt !== null) ?? null;
  const [roundVotes, comments, publication, design, identities, decisions, amendedCells, queries] = await Promise.all([
    statement ? votesOn(statement.id) : [],
    statement ? commentsOn(statement.id) : [],
    publicationStatus(study.id),
    studyDesign(study.id),
    studyIdentities(study.id),
    listCellDecisions(study.id),
    amendedAfterQueryCells(study.id),
    listStudyQueries(study.id),
  ]);
  const isChair = publication.round?.chairId === user.id;
  const own = roundVotes.find((v) => v.reviewerId === user.id) ?? null;
  // The frozen figures of the version sent; before one is sent, the blinded figures as they stand.
  const analysis = statement ? statement.snapshot.analysis : await studyAnalysis(study);
  const responses = statement ? statement.snapshot.responses : design.responses;
  const materials = statement ? statement.snapshot.materials : design.materials;
  // One material at a time keeps a large study's page light.
  const requested = new URL(request.url).searchParams.get("material");
  const material = materials.find((m) => m.code === requested) ?? materials[0] ?? null;
  // Reasons recorded before the naming check are shown with any lab or person withheld.
  const blinded = decisions.map((d) => ({ lab: d.lab, material: d.material, response: d.response, decision: d.decision, reason: withheldIdentities(d.reason, identities), decidedAt: d.decidedAt }));
  const results = material ? await submittedResultsOfMaterial(study.id, material.code) : [];
  return {
    study: { id: study.id, code: study.code },
    statement: statement && {
      version: statement.version,
      state: statement.state,
      textE691: statement.textE691,
      textC670: statement.textC670,
      frozenAt: statement.snapshot.frozenAt,
      dataVersion: statement.snapshot.dataVersion,
      labs: statement.snapshot.labs,
      replicates: statement.snapshot.replicates,
    },
    responses,
    materials,
    material: material?.code ?? null,
    decisions: blinded,
    // The queries behind the decisions, by lab code; the lab's name in the coordinator's list stays on the server.
    queries: blindedQueries(queries, identities),
    amendedCells,
    evidence: material ? materialRecord({ material: material.code, responses, groups: analysis.groups, excluded: analysis.excluded, results, decisions: blinded }) : [],
    // The charts draw the chosen material; the summary keeps every material's figures without the labs' rows.
    materialAnalysis: { ...analysis, groups: analysis.groups.filter((g) => g.material === material?.code), excluded: [] },
    overview: { ...analysis, groups: analysis.groups.map((g) => ({ ...g, labs: [] })), excluded: [] },
    votes: roundVotes.map(({ reviewerId, ...v }) => ({ ...v, ruleable: isChair && reviewerId !== user.id && v.stage === "awaiting_ruling" })),
    own: own && { choice: own.choice, reason: own.reason, stage: own.stage, answerRationale: own.answerRationale },
    round: publication.round && {
      chair: (await reviewersByName(study.id)).find((r) => r.id === publication.round!.chairId)?.name ?? null,
      isChair,
      reviewers: publication.round.reviewerIds.length,
    },
    // Once the round is closed, the tally of the votes this version received.
    tally: publication.round ? publication.check.tally : publicationCheck([...new Set(roundVotes.map((v) => v.reviewerId))], roundVotes).tally,
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

const REPLIES = [
  { value: "withdrawn", label: "Withdraw my objection" },
  { value: "maintained", label: "Maintain it" },
] as const;

const RULINGS = [
  { value: "upheld", label: "Upheld (the statement goes back for revision)" },
  { value: "not_upheld", label: "Not upheld" },
] as const;

export default function ReviewStudy({ loaderData, actionData }: Route.ComponentProps) {
  const { statement, votes, own, comments, refusal, round, tally, responses, material } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <StatementCaution />
      {statement ? (
        <Card title={`Statement version ${statement.version}`}>
          <p className="mb-3">
            <StateBadge view={STATEMENT_STATE[statement.state]} /> · {countOf(statement.labs, "lab")}, {countOf(loaderData.materials.length, "material")},{" "}
            {countOf(statement.replicates, "replicate")} · data version {statement.dataVersion}
            {statement.state === "in_review" && !refusal && (
              <>
                {" "}
                · <a href="#vote" className="font-semibold text-basalt-700 underline">Go to your vote</a>
              </>
            )}
          </p>
          <StatementTexts textE691={statement.textE691} textC670={statement.textC670} />
        </Card>
      ) : (
        <Card title="No statement yet">
          <p>
            The coordinator has not sent a statement to the committee yet. Below are the figures as they stand now, from the submitted results and the
            coordinator's decisions so far; they may still change before a version is frozen and sent to you.
          </p>
        </Card>
      )}
      <Card title="Cell decisions and the queries behind them">
        <DecisionsOnRecord decisions={loaderData.decisions} queries={loaderData.queries} />
        <h3 className="mb-1 mt-4 font-semibold text-basalt-800">Cells amended after a correction query</h3>
        <AmendedCellsNote amended={loaderData.amendedCells} />
      </Card>
      <Card title="Downloads">
        {/* Blinded like the page: lab codes, submitted results; the figures of the version sent, or the current ones before that. */}
        <StudyDownloads studyId={loaderData.study.id} what="analysis" />
        <StudyDownloads studyId={loaderData.study.id} what="results" />
      </Card>
      {material && (
        <Card title={`Results by lab code — ${material}`}>
          <div className="flex flex-col gap-4">
            <p>Every lab's replicate results on one material, with the cell statistics, the findings of the consistency and outlier tests, and the decision on the cell. Choose the material:</p>
            <MaterialPicker materials={loaderData.materials} shown={material} />
            <MaterialEvidence material={material} records={loaderData.evidence} responses={responses} />
          </div>
        </Card>
      )}
      {material && (
        <Card title={`Consistency charts — ${material}`}>
          <LazyCharts analysis={loaderData.materialAnalysis} responses={responses} />
        </Card>
      )}
      <Card title="Precision figures by material">
        <div className="flex flex-col gap-4">
          {responses.map((response) => (
            <PrecisionSummaryTable key={response.key} analysis={loaderData.overview} response={response} />
          ))}
        </div>
      </Card>
      {statement && (
        <>
          <section id="vote" aria-labelledby="vote-heading" className="grid gap-6 lg:grid-cols-3">
            <div className="rounded-lg bg-white p-5 shadow-sm lg:col-span-2">
              <h2 id="vote-heading" className="mb-3 text-lg font-semibold text-basalt-800">
                Your vote
              </h2>
              {own && (
                <p className="mb-3">
                  You voted <strong>{VOTE_CHOICE[own.choice].label.toLowerCase()}</strong>.{own.reason && <> Your reason: “{own.reason}”</>}
                </p>
              )}
              {own?.stage && <p className="mb-3 text-basalt-700">Your objection: {OBJECTION_STAGE_TEXT[own.stage]}.</p>}
              {!refusal && own?.stage === "awaiting_objector" && <ReplyForm answerRationale={own.answerRationale} chair={round?.chair ?? null} actionData={actionData} />}
              {refusal ? <p>{refusal}</p> : own?.stage && own.stage !== "awaiting_answer" ? null : <VoteForm own={own} actionData={actionData} />}
            </div>
            <aside aria-labelledby="vote-summary-heading" className="rounded-lg border border-basalt-200 bg-basalt-50 p-5">
              <h3 id="vote-summary-heading" className="mb-2 font-semibold text-basalt-800">
                What you are voting on
              </h3>
              <p className="mb-3">
                Version {statement.version} of the precision statement of <span className="keep-whole">{loaderData.study.code}</span>, frozen{" "}
                <span className="keep-whole">{formatDate(statement.frozenAt)}</span> from data version {statement.dataVersion}:{" "}
                {countOf(loaderData.decisions.filter((d) => d.decision === "excluded").length, "cell")} left out,{" "}
                {countOf(loaderData.decisions.filter((d) => d.decision === "retained").length, "cell")} retained after investigation.
              </p>
              <p className="mb-2" data-testid="tally">
                Tally: {tally.voted} of {tally.reviewers} reviewers voted · {tally.approve} approve · {tally.object} object · {tally.abstain} abstain
              </p>
              {round && (
                <p className="text-sm text-basalt-700">
                  Chair of this round: {round.chair ?? "—"}. {QUORUM_SENTENCE}
                </p>
              )}
            </aside>
          </section>
          <Card title="Votes and answers">
            <VoteList votes={votes} answerLabel="Coordinator's answer" actionFor={(v) => v.ruleable && !refusal && <RulingForm vote={v} actionData={actionData} />} />
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
  return (
    <PostForm form={form} submitLabel="Record my vote" hidden={{ intent: "vote" }} className="flex flex-col gap-3">
      <RadioField label={own ? "Change your vote" : "Your vote"} options={CHOICES} {...fieldProps(fields.choice)} />
      <TextAreaField label="Reason" hint="Required when you object." {...fieldProps(fields.reason)} />
    </PostForm>
  );
}

/** The objector's reply to a "not upheld" answer: withdraw, or maintain it for the chair's ruling. */
function ReplyForm({ answerRationale, chair, actionData }: { answerRationale: string | null; chair: string | null; actionData: ActionData }) {
  const [form, fields] = useSchemaForm(replySchema, { reply: actionData, intent: "reply" });
  return (
    <PostForm form={form} submitLabel="Send my reply" hidden={{ intent: "reply" }} className="mb-4 flex flex-col gap-3 rounded border border-ochre-300 p-3">
      <p>
        The coordinator answered your objection <strong>not upheld</strong>: “{answerRationale}”. Withdraw the objection, or maintain it and the chair
        {chair ? ` (${chair})` : ""} will rule on it.
      </p>
      <RadioField label="Your reply" options={REPLIES} {...fieldProps(fields.reply)} />
      <TextAreaField label="Note" hint="Required when you maintain the objection." {...fieldProps(fields.note)} />
    </PostForm>
  );
}

type RoundVote = Route.ComponentProps["loaderData"]["votes"][number];

/** The chair's ruling on one maintained objection; the action's answer belongs to it only when it names this vote. */
function RulingForm({ vote, actionData }: { vote: RoundVote; actionData: ActionData }) {
  const [form, fields] = useSchemaForm(rulingSchema, { reply: replyAbout(actionData, "voteId", vote.id), intent: "rule", id: `ruling-${vote.id}` });
  return (
    <PostForm form={form} submitLabel="Record the ruling" hidden={{ intent: "rule", voteId: vote.id }} className="mt-3 flex flex-col gap-3">
      <RadioField label={`Your ruling as chair on ${vote.reviewer}'s maintained objection`} options={RULINGS} {...fieldProps(fields.ruling)} />
      <TextAreaField label="Reason for the ruling (recorded and shown to the committee)" {...fieldProps(fields.reason)} />
    </PostForm>
  );
}

function CommentForm({ actionData }: { actionData: ActionData }) {
  const [form, fields] = useSchemaForm(commentSchema, {
    reply: actionData,
    intent: "comment",
  });
  return (
    <PostForm form={form} submitLabel="Add the comment" submitVariant="secondary" hidden={{ intent: "comment" }} className="flex flex-col gap-3">
      <TextAreaField label="Add a comment" {...fieldProps(fields.body)} />
    </PostForm>
  );
}
