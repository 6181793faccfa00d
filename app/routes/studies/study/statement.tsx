import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/statement";
import { fieldProps, FormErrors, formWideErrors, PostForm, refusalOf, replyAbout, useSchemaForm } from "~/components/forms";
import { PrecisionSummaryTable } from "~/components/precision-tables";
import { StateBadge } from "~/components/state-badge";
import { ExcludedCells, StatementCaution, StatementTexts } from "~/components/statement-parts";
import { StatementBundle } from "~/components/statement-bundle";
import { VoteList } from "~/components/vote-trail";
import type { StudyPageHandle } from "~/components/study-frame";
import { ConfirmStep } from "~/components/confirm-dialog";
import { Button, Card, Notice, RadioField, SelectField, SimpleTable, TextAreaField } from "~/components/ui";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { blindingRefusals } from "~/lib/blinding";
import { formatDate, formatDateTime } from "~/lib/format";
import { QUORUM_SENTENCE } from "~/lib/review/publication";
import { writeRefusal } from "~/lib/write-rules";
import { STATEMENT_STATE } from "~/lib/state-labels";
import { MOVE_CONSEQUENCES } from "~/lib/study-lifecycle";
import { studyPageMeta } from "~/lib/study-page-meta";
import {
  answerObjection,
  freezeStatement,
  listStatements,
  publicationStatus,
  publishStudy,
  reviewersByName,
  sendToReview,
  updateStatementText,
  votesOn,
} from "~/models/statement.server";
import { studyIdentities } from "~/models/blinding.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Statement" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  const statements = await listStatements(study.id);
  const latest = statements[0] ?? null;
  const [roundVotes, publication, reviewers] = await Promise.all([latest ? votesOn(latest.id) : [], publicationStatus(study.id), reviewersByName(study.id)]);
  return {
    study: { id: study.id, code: study.code, title: study.title, state: study.state, dataVersion: study.dataVersion },
    latest,
    earlier: statements.slice(1).map(({ id, version, state, dataVersion, createdAt }) => ({ id, version, state, dataVersion, createdAt: createdAt.toISOString() })),
    votes: roundVotes,
    publication: publication.check,
    chair: publication.round ? (reviewers.find((r) => r.id === publication.round!.chairId)?.name ?? null) : null,
    reviewers,
    draftingRefusal: writeRefusal("statements", study.state),
    reviewRefusal: writeRefusal("review", study.state),
  };
}

const id = z.coerce.number({ message: "Missing id." }).int().positive("Missing id.");
const TEXT_TOO_LONG = "Keep the text under 20,000 characters.";
const statementText = (form: string) => {
  const tooShort = `The ${form} text needs at least 20 characters.`;
  return z.string({ message: tooShort }).trim().min(20, tooShort).max(20000, TEXT_TOO_LONG).superRefine(refuseUnsafeCharacters({ multiline: true }));
};
const RATIONALE_TOO_SHORT = "Give the rationale the committee will read (at least 10 characters).";

const statementForms = {
  freeze: z.object({ intent: z.literal("freeze") }),
  saveText: z.object({ intent: z.literal("save-text"), statementId: id, textE691: statementText("E691"), textC670: statementText("C670") }),
  send: z.object({
    intent: z.literal("send"),
    statementId: id,
    chairId: z.coerce.number({ message: "Choose the chair of the round." }).int().positive("Choose the chair of the round."),
  }),
  answer: z.object({
    intent: z.literal("answer"),
    voteId: id,
    answer: z.enum(["upheld", "not_upheld"], { message: "Choose upheld or not upheld." }),
    rationale: z.string({ message: RATIONALE_TOO_SHORT }).trim().min(10, RATIONALE_TOO_SHORT).max(4000, "Keep the rationale under 4000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })),
  }),
  publish: z.object({ intent: z.literal("publish") }),
};

const statementSchema = z.discriminatedUnion(
  "intent",
  [statementForms.freeze, statementForms.saveText, statementForms.send, statementForms.answer, statementForms.publish],
  { error: "Unknown action." },
);

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: statementSchema });
  if (submission.status !== "success") return refuse(submission);
  const form = submission.value;
  // The committee reads the statement's text: it must not name a lab or its people.
  if (form.intent === "save-text") {
    const unblinding = blindingRefusals({ textE691: form.textE691, textC670: form.textC670 }, await studyIdentities(study.id));
    if (unblinding) return refuse(submission, unblinding);
  }
  // The models refuse what the study's state or the round does not allow (409), shown above the forms.
  const outcome = await withRefusals(
    submission,
    async () => {
      switch (form.intent) {
        case "freeze": {
          const row = await freezeStatement(study, user.id);
          return `Version ${row.version} frozen at data version ${row.dataVersion}.`;
        }
        case "save-text":
          if (!(await updateStatementText(study, user.id, form.statementId, form))) notFound();
          return "Text saved.";
        case "send":
          if (!(await sendToReview(study, user.id, form.statementId, form.chairId, request))) notFound();
          return "Sent to the committee; every reviewer has been e-mailed.";
        case "answer":
          if (!(await answerObjection(study, user.id, form, request))) notFound();
          return form.answer === "upheld"
            ? "Objection upheld: the statement is back in drafting; freeze a new version for a new round."
            : "Answer recorded; the reviewer is asked to withdraw or maintain the objection.";
        case "publish":
          await publishStudy(study, user.id);
          return "Published. The study is now read-only.";
      }
    },
    409,
  );
  if (!outcome.ok) return outcome.reply;
  return redirectWithToast(`/studies/${study.id}/statement`, outcome.value);
}

export default function StatementPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, latest, earlier, votes, publication } = loaderData;
  const stale = latest && latest.dataVersion !== study.dataVersion;
  // Refusals of the button-only forms (freeze, publish) and of the whole page's state.
  const refusals = ["freeze", "publish"].flatMap((intent) => refusalOf(actionData, intent));
  return (
    <>
      <div className="flex flex-col gap-6">
        <p className="text-basalt-700">The precision statement: frozen versions of the analysis, their texts, and the committee's round.</p>
        <StatementCaution />
        {study.state === "published" && <StatementBundle studyId={study.id} />}
        <FormErrors errors={refusals} />
        {!loaderData.draftingRefusal && (
          <Card title="Freeze the analysis">
            <p className="mb-3">
              Freezing takes the analysis as it stands now (data version {study.dataVersion}, with the saved cell decisions) and makes it a new statement
              version with generated draft texts. Later changes of results or decisions do not alter a frozen version.
            </p>
            <Form method="post">
              <input type="hidden" name="intent" value="freeze" />
              <Button type="submit">{latest ? "Freeze a new version" : "Freeze the first version"}</Button>
            </Form>
          </Card>
        )}
        {!latest ? (
          <Card>
            <p>No statement version yet.</p>
          </Card>
        ) : (
          <>
            <Card title={`Version ${latest.version}`}>
              <p className="mb-3">
                <StateBadge view={STATEMENT_STATE[latest.state]} /> · frozen {formatDateTime(latest.snapshot.frozenAt)} at data
                version {latest.dataVersion} · {latest.snapshot.labs} labs, {latest.snapshot.materials.length} materials, {latest.snapshot.replicates} replicates
              </p>
              {stale && latest.state === "draft" && (
                <Notice tone="caution">Results or decisions changed after this version was frozen (data version now {study.dataVersion}). Freeze a new version before sending.</Notice>
              )}
              {latest.state === "draft" && !loaderData.draftingRefusal ? (
                <TextForm key={latest.id} statement={latest} reply={actionData} />
              ) : (
                <StatementTexts textE691={latest.textE691} textC670={latest.textC670} />
              )}
              {latest.state === "draft" && !loaderData.draftingRefusal && <SendForm key={latest.id} statement={latest} reviewers={loaderData.reviewers} reply={actionData} />}
            </Card>
            <Card title="Figures of this version">
              <p className="mb-3 text-sm text-basalt-700">These numbers are the frozen snapshot; editing the text does not change them.</p>
              <div className="flex flex-col gap-4">
                {latest.snapshot.responses.map((r) => (
                  <div key={r.key}>
                    <h3 className="mb-1 font-semibold text-basalt-800">{r.name}</h3>
                    <PrecisionSummaryTable analysis={latest.snapshot.analysis} response={r} />
                  </div>
                ))}
                <ExcludedCells excluded={latest.snapshot.analysis.excluded} />
              </div>
            </Card>
            {latest.state !== "draft" && <Round loaderData={loaderData} reply={actionData} votes={votes} publication={publication} />}
          </>
        )}
        {earlier.length > 0 && (
          <Card title="Earlier versions">
            <SimpleTable caption="Earlier statement versions" headers={["Version", "State", "Data version", "Frozen"]} rows={earlier.map((s) => [s.version, STATEMENT_STATE[s.state].label, s.dataVersion, formatDate(s.createdAt)])} />
          </Card>
        )}
      </div>
    </>
  );
}

type LoaderData = Route.ComponentProps["loaderData"];

function TextForm({ statement, reply }: { statement: NonNullable<LoaderData["latest"]>; reply: unknown }) {
  const [form, fields] = useSchemaForm(statementForms.saveText, {
    reply,
    intent: "save-text",
    defaultValue: { statementId: String(statement.id), textE691: statement.textE691, textC670: statement.textC670 },
  });
  return (
    <PostForm form={form} submitLabel="Save the text" submitVariant="secondary" hidden={{ intent: "save-text", statementId: statement.id }} className="mt-4 flex flex-col gap-4">
      <TextAreaField label="Statement text, E691 form (r and R)" rows={14} {...fieldProps(fields.textE691)} />
      <TextAreaField label="Statement text, C670 form (1s and d2s)" rows={14} {...fieldProps(fields.textC670)} />
    </PostForm>
  );
}

/** Sends a draft version to the committee with the reviewer who chairs the round. */
function SendForm({ statement, reviewers, reply }: { statement: NonNullable<LoaderData["latest"]>; reviewers: LoaderData["reviewers"]; reply: unknown }) {
  const [form, fields] = useSchemaForm(statementForms.send, { reply, intent: "send", defaultValue: { statementId: String(statement.id) } });
  return (
    <Form method="post" className="mt-4 flex flex-col gap-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="send" />
      <input type="hidden" name="statementId" value={statement.id} />
      <FormErrors errors={formWideErrors(form)} />
      <SelectField
        label="Chair of the round (rules on objections maintained after your answer)"
        {...fieldProps(fields.chairId)}
        options={[{ value: "", label: "Choose a reviewer" }, ...reviewers.map((r) => ({ value: String(r.id), label: r.name }))]}
      />
      <div>
        <ConfirmStep
          label={`Send version ${statement.version} to the committee`}
          title={`Send version ${statement.version} to the committee?`}
          consequences={
            <>
              <p>{MOVE_CONSEQUENCES.in_review}</p>
              <p>Reviewers of this round: {reviewers.map((r) => r.name).join(", ") || "none yet"}.</p>
              <p>{QUORUM_SENTENCE}</p>
            </>
          }
          confirmLabel="Send to the committee"
        />
      </div>
    </Form>
  );
}

type Vote = LoaderData["votes"][number];

const ANSWERS = [
  { value: "upheld", label: "Upheld (revise the statement)" },
  { value: "not_upheld", label: "Not upheld" },
] as const;

/** The coordinator's answer to one objection; the action's answer belongs to it only when it names this vote. */
function AnswerForm({ vote, reply }: { vote: Vote; reply: unknown }) {
  const [form, fields] = useSchemaForm(statementForms.answer, { reply: replyAbout(reply, "voteId", vote.id), intent: "answer", id: `answer-${vote.id}` });
  return (
    <PostForm form={form} submitLabel="Record the answer" submitVariant="secondary" hidden={{ intent: "answer", voteId: vote.id }} className="mt-3 flex flex-col gap-3">
      <RadioField label={`Your answer to ${vote.reviewer}'s objection`} options={ANSWERS} {...fieldProps(fields.answer)} />
      <TextAreaField label="Rationale (shown to every reviewer)" {...fieldProps(fields.rationale)} />
    </PostForm>
  );
}

function Round({ loaderData, reply, votes, publication }: { loaderData: LoaderData; reply: unknown; votes: LoaderData["votes"]; publication: LoaderData["publication"] }) {
  const canAnswer = !loaderData.reviewRefusal && loaderData.latest?.state === "in_review";
  const tally = publication.tally;
  return (
    <Card title="Committee round">
      {loaderData.chair && <p className="mb-2">Chair: {loaderData.chair}.</p>}
      <p className="mb-2 text-basalt-700">{QUORUM_SENTENCE}</p>
      <p className="mb-3" data-testid="tally">
        Tally: {tally.voted} of {tally.reviewers} reviewers voted · {tally.approve} approve · {tally.object} object · {tally.abstain} abstain
        {tally.withdrawn > 0 && <> (of which {tally.withdrawn} withdrawn objections)</>}
      </p>
      <VoteList votes={votes} answerLabel="Answer" actionFor={(v) => v.choice === "object" && !v.answer && canAnswer && <AnswerForm vote={v} reply={reply} />} />
      {loaderData.latest?.state === "in_review" && (
        <div className="mt-4 flex flex-col gap-3">
          {publication.problems.length > 0 && (
            <ul className="list-disc pl-6">
              {publication.problems.map((p) => (
                <li key={p}>{p}</li>
              ))}
            </ul>
          )}
          <Form method="post">
            <input type="hidden" name="intent" value="publish" />
            <ConfirmStep
              label="Publish the study"
              title="Publish the study?"
              consequences={
                <>
                  <p>{MOVE_CONSEQUENCES.published}</p>
                  <p>
                    Tally: {tally.approve} approve, {tally.object} object, {tally.abstain} abstain of {tally.reviewers} reviewers.
                  </p>
                </>
              }
              confirmLabel="Publish"
              disabled={!publication.allowed}
            />
          </Form>
        </div>
      )}
    </Card>
  );
}
