import { Form } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/statement";
import { PrecisionSummaryTable } from "~/components/precision-tables";
import { ExcludedCells, StatementCaution, StatementTexts } from "~/components/statement-parts";
import { Badge, Button, Card, Notice, PageHeader, SelectField, SimpleTable, TextAreaField } from "~/components/ui";
import { type ActionResult, refused } from "~/lib/form-results";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { writeRefusal } from "~/lib/write-rules";
import { STATE_LABEL } from "~/lib/state-labels";
import { MOVE_CONSEQUENCES } from "~/lib/study-lifecycle";
import {
  answerObjection,
  freezeStatement,
  listStatements,
  publicationStatus,
  publishStudy,
  sendToReview,
  StatementError,
  updateStatementText,
  reviewersByName,
  votesOn,
} from "~/models/statement.server";
import { ConfirmStep } from "~/components/confirm-dialog";
import { OBJECTION_STAGE_TEXT, QUORUM_SENTENCE } from "~/lib/review/publication";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Statement · ${data?.study.code ?? "Study"} · Ringbatch` }];

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
const textSchema = z.object({
  statementId: id,
  textE691: z.string().trim().min(20, "The E691 text needs at least 20 characters.").max(20000, "Keep the text under 20,000 characters."),
  textC670: z.string().trim().min(20, "The C670 text needs at least 20 characters.").max(20000, "Keep the text under 20,000 characters."),
});
const sendSchema = z.object({ statementId: id, chairId: z.coerce.number({ message: "Choose the chair of the round." }).int().positive("Choose the chair of the round.") });
const answerSchema = z.object({
  voteId: id,
  answer: z.enum(["upheld", "not_upheld"], { message: "Choose upheld or not upheld." }),
  rationale: z.string().trim().min(10, "Give the rationale the committee will read (at least 10 characters).").max(4000, "Keep the rationale under 4000 characters."),
});

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  const fail = (errors: FieldErrors, values: Record<string, string>, status = 400) => refused(intent, errors, values, status);
  try {
    switch (intent) {
      case "freeze": {
        const row = await freezeStatement(study, user.id);
        return { intent, done: `Version ${row.version} frozen at data version ${row.dataVersion}.` } satisfies ActionResult;
      }
      case "save-text": {
        const parsed = parseForm(textSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        if (!(await updateStatementText(study, user.id, parsed.data.statementId, parsed.data))) notFound();
        return { intent, done: "Text saved." } satisfies ActionResult;
      }
      case "send": {
        const parsed = parseForm(sendSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        if (!(await sendToReview(study, user.id, parsed.data.statementId, parsed.data.chairId, request))) notFound();
        return { intent, done: "Sent to the committee; every reviewer has been e-mailed." } satisfies ActionResult;
      }
      case "answer": {
        const parsed = parseForm(answerSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        if (!(await answerObjection(study, user.id, parsed.data, request))) notFound();
        return {
          intent,
          done: parsed.data.answer === "upheld" ? "Objection upheld: the statement is back in drafting; freeze a new version for a new round." : "Answer recorded; the reviewer is asked to withdraw or maintain the objection.",
        } satisfies ActionResult;
      }
      case "publish": {
        await publishStudy(study, user.id);
        return { intent, done: "Published. The study is now read-only." } satisfies ActionResult;
      }
      default:
        return fail({ form: "Unknown action." }, {});
    }
  } catch (error) {
    if (error instanceof StatementError) return fail({ form: error.message }, Object.fromEntries([...form].map(([k, v]) => [k, String(v)])), 409);
    throw error;
  }
}

const STATEMENT_TONE = { draft: "neutral", in_review: "ochre", approved: "leaf", returned: "signal" } as const;
const CHOICE_LABEL = { approve: "Approve", object: "Object", abstain: "Abstain" } as const;

export default function StatementPage({ loaderData, actionData }: Route.ComponentProps) {
  const { study, latest, earlier, votes, publication } = loaderData;
  const outcome = actionData as ActionResult | undefined;
  const failed = outcome?.errors ? outcome : null;
  const stale = latest && latest.dataVersion !== study.dataVersion;
  return (
    <>
      <PageHeader
        title={`Precision statement — ${study.code}`}
        subtitle={
          <>
            {study.title} · <Badge>{STATE_LABEL[study.state]}</Badge>
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <StatementCaution />
        {outcome?.done && <Notice tone="success">{outcome.done}</Notice>}
        {failed?.errors?.form && <Notice tone="error">{failed.errors.form}</Notice>}
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
                <Badge tone={STATEMENT_TONE[latest.state]}>{latest.state.replace("_", " ")}</Badge> · frozen {latest.snapshot.frozenAt.slice(0, 16).replace("T", " ")} at data
                version {latest.dataVersion} · {latest.snapshot.labs} labs, {latest.snapshot.materials.length} materials, {latest.snapshot.replicates} replicates
              </p>
              {stale && latest.state === "draft" && (
                <Notice tone="caution">Results or decisions changed after this version was frozen (data version now {study.dataVersion}). Freeze a new version before sending.</Notice>
              )}
              {latest.state === "draft" && !loaderData.draftingRefusal ? (
                <Form method="post" className="mt-4 flex flex-col gap-4">
                  <input type="hidden" name="intent" value="save-text" />
                  <input type="hidden" name="statementId" value={latest.id} />
                  <TextAreaField name="textE691" label="Statement text, E691 form (r and R)" rows={14} error={failed?.errors?.textE691} defaultValue={failed?.values?.textE691 ?? latest.textE691} />
                  <TextAreaField name="textC670" label="Statement text, C670 form (1s and d2s)" rows={14} error={failed?.errors?.textC670} defaultValue={failed?.values?.textC670 ?? latest.textC670} />
                  <div>
                    <Button type="submit" variant="secondary">
                      Save the text
                    </Button>
                  </div>
                </Form>
              ) : (
                <StatementTexts textE691={latest.textE691} textC670={latest.textC670} />
              )}
              {latest.state === "draft" && !loaderData.draftingRefusal && (
                <Form method="post" className="mt-4 flex flex-col gap-3">
                  <input type="hidden" name="intent" value="send" />
                  <input type="hidden" name="statementId" value={latest.id} />
                  <SelectField
                    label="Chair of the round (rules on objections maintained after your answer)"
                    name="chairId"
                    defaultValue={failed?.values?.chairId ?? ""}
                    error={failed?.errors?.chairId}
                    options={[{ value: "", label: "Choose a reviewer" }, ...loaderData.reviewers.map((r) => ({ value: String(r.id), label: r.name }))]}
                  />
                  <div>
                    <ConfirmStep
                      label={`Send version ${latest.version} to the committee`}
                      title={`Send version ${latest.version} to the committee?`}
                      consequences={
                        <>
                          <p>{MOVE_CONSEQUENCES.in_review}</p>
                          <p>Reviewers of this round: {loaderData.reviewers.map((r) => r.name).join(", ") || "none yet"}.</p>
                          <p>{QUORUM_SENTENCE}</p>
                        </>
                      }
                      confirmLabel="Send to the committee"
                    />
                  </div>
                </Form>
              )}
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
            {latest.state !== "draft" && <Round loaderData={loaderData} failed={failed} votes={votes} publication={publication} />}
          </>
        )}
        {earlier.length > 0 && (
          <Card title="Earlier versions">
            <SimpleTable caption="Earlier statement versions" headers={["Version", "State", "Data version", "Frozen"]} rows={earlier.map((s) => [s.version, s.state.replace("_", " "), s.dataVersion, s.createdAt.slice(0, 10)])} />
          </Card>
        )}
      </div>
    </>
  );
}

type LoaderData = Route.ComponentProps["loaderData"];

function Round({ loaderData, failed, votes, publication }: { loaderData: LoaderData; failed: ActionResult | null; votes: LoaderData["votes"]; publication: LoaderData["publication"] }) {
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
      {votes.length === 0 ? (
        <p>No vote yet.</p>
      ) : (
        <ul className="flex flex-col gap-3">
          {votes.map((v) => (
            <li key={v.id} className="rounded border border-basalt-100 p-3">
              <p>
                <strong>{v.reviewer}</strong>: {CHOICE_LABEL[v.choice]}
                {v.reason && <> — “{v.reason}”</>}
              </p>
              {v.answer && (
                <p className="mt-1">
                  Answer: <strong>{v.answer === "upheld" ? "upheld" : "not upheld"}</strong> — {v.answerRationale}
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
              {v.choice === "object" && !v.answer && canAnswer && (
                <Form method="post" className="mt-3 flex flex-col gap-3">
                  <input type="hidden" name="intent" value="answer" />
                  <input type="hidden" name="voteId" value={v.id} />
                  <fieldset>
                    <legend className="font-semibold text-basalt-800">Your answer to {v.reviewer}'s objection</legend>
                    <div className="flex flex-wrap gap-4">
                      <label className="inline-flex min-h-11 items-center gap-2">
                        <input type="radio" name="answer" value="upheld" className="size-5" /> Upheld (revise the statement)
                      </label>
                      <label className="inline-flex min-h-11 items-center gap-2">
                        <input type="radio" name="answer" value="not_upheld" className="size-5" /> Not upheld
                      </label>
                    </div>
                    {failed?.values?.voteId === String(v.id) && failed.errors?.answer && <p className="text-sm font-semibold text-signal-700">{failed.errors.answer}</p>}
                  </fieldset>
                  <TextAreaField
                    name="rationale"
                    id={`rationale-${v.id}`}
                    label="Rationale (shown to every reviewer)"
                    error={failed?.values?.voteId === String(v.id) ? failed.errors?.rationale : undefined}
                    defaultValue={failed?.values?.voteId === String(v.id) ? failed.values.rationale : ""}
                  />
                  <div>
                    <Button type="submit" variant="secondary">
                      Record the answer
                    </Button>
                  </div>
                </Form>
              )}
            </li>
          ))}
        </ul>
      )}
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
