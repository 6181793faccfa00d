import { Form, Link, useFetcher, useNavigation } from "react-router";
import { useState } from "react";
import { z } from "zod";
import { data } from "react-router";
import type { Route } from "./+types/analysis";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { PrecisionTables } from "~/components/precision-tables";
import { Badge, Button, Card, Notice, PageHeader, SimpleTable, TextAreaField } from "~/components/ui";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { requireStudy } from "~/server/study-context.server";
import { type ComputedGroup, isSignificanceLevel, SIGNIFICANCE_LEVELS, type StudyAnalysis } from "~/lib/precision";
import { type CellRef, cellKey, parseCellList, sameCell } from "~/lib/review/cells";
import { flaggedCells, flagStatistic, suggestedQuestion } from "~/lib/review/flags";
import { ALPHA_LABEL, figureDecimals, formatFigure } from "~/lib/review/format";
import { writeRefusal } from "~/lib/write-rules";
import { ConfirmStep } from "~/components/confirm-dialog";
import { STATE_LABEL } from "~/lib/state-labels";
import { studyAnalysis, withdrawnLabCodes } from "~/models/analysis.server";
import { QueryError, listStudyQueries, raiseQuery } from "~/models/coordinator-queries.server";
import { DecisionError, cellEvidence, decisionHistory, listCellDecisions, saveCellDecision } from "~/models/decisions.server";
import { studyDesign } from "~/models/statement.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Analysis · ${data?.study.code ?? "Study"} · Ringbatch` }];

function selectedCell(url: URL): CellRef | null {
  const parsed = parseCellList(url.searchParams.get("cell"));
  return "cells" in parsed && parsed.cells.length === 1 ? parsed.cells[0]! : null;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  const url = new URL(request.url);
  const alphaParam = Number(url.searchParams.get("alpha"));
  const alpha = isSignificanceLevel(alphaParam) ? alphaParam : study.significanceLevel;
  const cell = selectedCell(url);
  const [analysis, withdrawn, design, decisions, history, queries, evidence] = await Promise.all([
    studyAnalysis(study, { alpha }),
    withdrawnLabCodes(study.id),
    studyDesign(study.id),
    listCellDecisions(study.id),
    decisionHistory(study.id),
    listStudyQueries(study.id),
    cell ? cellEvidence(study.id, cell) : [],
  ]);
  return {
    study: { id: study.id, code: study.code, title: study.title, state: study.state, dataVersion: study.dataVersion },
    alpha,
    analysis,
    withdrawn,
    ...design,
    decisions,
    history,
    queries: queries.map(({ labName: _labName, ...q }) => q),
    flagged: flaggedCells(analysis),
    cell,
    cellEvidence: evidence,
    decisionRefusal: writeRefusal("decisions", study.state),
    queryRefusal: writeRefusal("queries", study.state),
  };
}

const cellFields = {
  lab: z.string().trim().min(1, "Choose a cell."),
  material: z.string().trim().min(1, "Choose a cell."),
  response: z.string().trim().min(1, "Choose a cell."),
};

const askSchema = z.object({
  ...cellFields,
  statistic: z.string().trim().max(300, "Keep the statistic under 300 characters."),
  question: z.string().trim().min(10, "Write the question for the lab (at least 10 characters).").max(2000, "Keep the question under 2000 characters."),
  // A checkbox: present means the lab may amend the cell while the query is open.
  asksCorrection: z.literal("on").optional().transform((v) => v === "on"),
});

const decideSchema = z.object({
  ...cellFields,
  decision: z.enum(["retained", "excluded"], { message: "Choose retain or exclude." }),
  reason: z
    .string()
    .trim()
    .min(10, "Give the reason (at least 10 characters): the assignable cause or the statistical justification.")
    .max(2000, "Keep the reason under 2000 characters."),
});

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const form = await request.formData();
  const intent = form.get("intent");
  if (intent === "ask") {
    const parsed = parseForm(askSchema, form);
    if (!parsed.ok) return data({ intent, ok: false as const, errors: parsed.errors, values: parsed.values }, { status: 400 });
    try {
      await raiseQuery(study, user.id, parsed.data, request);
    } catch (error) {
      if (error instanceof QueryError) return data({ intent, ok: false as const, errors: { form: error.message } as FieldErrors, values: parsed.values }, { status: 409 });
      throw error;
    }
    return { intent, ok: true as const, message: `Query sent to lab ${parsed.data.lab}.` };
  }
  if (intent === "decide") {
    const parsed = parseForm(decideSchema, form);
    if (!parsed.ok) return data({ intent, ok: false as const, errors: parsed.errors, values: parsed.values }, { status: 400 });
    try {
      await saveCellDecision(study, user.id, parsed.data);
    } catch (error) {
      if (error instanceof DecisionError) return data({ intent, ok: false as const, errors: { form: error.message } as FieldErrors, values: parsed.values }, { status: 409 });
      throw error;
    }
    const verb = parsed.data.decision === "excluded" ? "excluded" : "retained";
    return { intent, ok: true as const, message: `Cell ${cellKey(parsed.data)} ${verb}. Re-check the flags below before deciding on another cell.` };
  }
  return data({ intent: null, ok: false as const, errors: { form: "Unknown action." } as FieldErrors, values: {} }, { status: 400 });
}

type LoaderData = Route.ComponentProps["loaderData"];
type ActionData = Route.ComponentProps["actionData"];

const cellHref = (alpha: number, cell: CellRef) => `?alpha=${alpha}&cell=${encodeURIComponent(cellKey(cell))}#investigate`;

export default function Analysis({ loaderData, actionData }: Route.ComponentProps) {
  const { study, analysis, responses, alpha, decisions, cell } = loaderData;
  const excludedKeys = new Set(decisions.filter((d) => d.decision === "excluded").map(cellKey));
  return (
    <>
      <PageHeader
        title={`Analysis — ${study.code}`}
        subtitle={
          <>
            {study.title} · <Badge>{STATE_LABEL[study.state]}</Badge> · data version {study.dataVersion}
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <Notice tone="caution">
          <strong>Before leaving any result out:</strong> a flag only starts an investigation. Exclude a cell only when there is an assignable
          cause (a batching, testing or recording fault the lab confirms) or a clear statistical justification, give that reason, and look at the
          flags again after every exclusion — removing one cell changes the critical values and statistics of the others. These figures support the
          committee's judgement; they do not replace it.
        </Notice>
        {actionData?.ok && <Notice tone="success">{actionData.message}</Notice>}
        {loaderData.withdrawn.length > 0 && (
          <Notice>
            Not in the analysis: {loaderData.withdrawn.join(", ")}, withdrawn from the study. Their results stay on the results page and in the audit
            trail.
          </Notice>
        )}
        <Card title="Significance level">
          <Form method="get" className="flex flex-wrap items-end gap-4">
            <fieldset className="flex flex-wrap gap-4">
              <legend className="mb-1 font-semibold text-basalt-800">Critical values of h and k at</legend>
              {SIGNIFICANCE_LEVELS.map((level) => (
                <label key={level} className="inline-flex min-h-11 items-center gap-2">
                  <input type="radio" name="alpha" value={level} defaultChecked={level === alpha} className="size-5" />
                  {ALPHA_LABEL[level]}
                  {level === 0.005 && " (E691)"}
                </label>
              ))}
            </fieldset>
            {cell && <input type="hidden" name="cell" value={cellKey(cell)} />}
            <Button type="submit" variant="secondary">
              Recompute
            </Button>
          </Form>
        </Card>
        <FlaggedCells loaderData={loaderData} excludedKeys={excludedKeys} />
        {cell && <Investigation key={cellKey(cell)} loaderData={loaderData} actionData={actionData} cell={cell} />}
        <Decisions loaderData={loaderData} />
        <Card title="Charts">
          <LazyCharts analysis={analysis} responses={responses} />
        </Card>
        <Card title="Tables">
          <PrecisionTables
            analysis={analysis}
            responses={responses}
            headingLevel={3}
            labAction={(group, lab) => (
              <Link to={cellHref(alpha, { lab: lab.lab, material: group.material, response: group.response })} className="font-semibold text-basalt-700 underline">
                {lab.flags.length > 0 ? "Ask the lab / decide" : "Decide"}
                <span className="sr-only">
                  {" "}
                  on lab {lab.lab}, {group.material}, {group.response}
                </span>
              </Link>
            )}
          />
        </Card>
      </div>
    </>
  );
}

function FlaggedCells({ loaderData, excludedKeys }: { loaderData: LoaderData; excludedKeys: Set<string> }) {
  const { flagged, queries, alpha, analysis } = loaderData;
  return (
    <Card title="Flagged cells">
      {flagged.length === 0 ? (
        <p>No lab is flagged at the {ALPHA_LABEL[alpha]} level{analysis.excluded.length > 0 ? " with the current exclusions" : ""}.</p>
      ) : (
        <SimpleTable
          caption="Cells flagged by the consistency statistics or the outlier tests"
          headers={["Lab", "Material", "Response", "Statistic", "Query", "Decision", ""]}
          rows={flagged.map((f) => {
            const query = queries.find((q) => sameCell(q, f));
            return [
              <span key="lab" className="font-semibold">
                <span aria-hidden="true">⚑ </span>
                {f.lab}
              </span>,
              f.material,
              f.response,
              f.statistic,
              query ? <Badge key="q" tone={query.state === "closed" ? "leaf" : "ochre"}>{query.state}</Badge> : "none",
              excludedKeys.has(cellKey(f)) ? "excluded" : "—",
              <Link key="go" to={cellHref(alpha, f)} className="font-semibold text-basalt-700 underline">
                Investigate<span className="sr-only"> lab {f.lab}, {f.material}, {f.response}</span>
              </Link>,
            ];
          })}
        />
      )}
    </Card>
  );
}

function findGroup(analysis: StudyAnalysis, cell: CellRef) {
  return analysis.groups.find((g) => g.material === cell.material && g.response === cell.response) ?? null;
}

function Investigation({ loaderData, actionData, cell }: { loaderData: LoaderData; actionData: ActionData; cell: CellRef }) {
  const { analysis, responses, cellEvidence, decisions, queries, study, alpha } = loaderData;
  const response = responses.find((r) => r.key === cell.response);
  const group = findGroup(analysis, cell);
  const lab = group?.labs.find((l) => l.lab === cell.lab) ?? null;
  const decision = decisions.find((d) => sameCell(d, cell));
  const excluded = analysis.excluded.some((e) => sameCell(e, cell));
  const statistic = group?.status === "computed" && lab ? flagStatistic(group, lab) : "";
  const d = figureDecimals(response?.decimals ?? 0);
  const cellQueries = queries.filter((q) => sameCell(q, cell));
  const photos = cellEvidence.filter((e) => e.photoFileId !== null);
  return (
    <section id="investigate" aria-labelledby="investigate-heading" className="rounded-lg border-2 border-ochre-600 bg-white p-5 shadow-sm">
      <h2 id="investigate-heading" className="mb-3 text-lg font-semibold text-basalt-800">
        Investigate lab {cell.lab} · {cell.material} · {response?.name ?? cell.response}
      </h2>
      {!response || cellEvidence.length === 0 ? (
        <p>This lab has no submitted results for that material and response.</p>
      ) : (
        <div className="grid gap-6 lg:grid-cols-2">
          <div className="flex flex-col gap-3">
            <SimpleTable
              caption={`Replicate results of lab ${cell.lab}`}
              headers={["Replicate", `Result${response.unit ? ` (${response.unit})` : ""}`]}
              rows={cellEvidence.map((e) => [e.replicate, formatFigure(e.value, response.decimals)])}
            />
            <p>
              {excluded ? (
                <>This cell is <strong>excluded</strong>; its statistics are not part of the figures.</>
              ) : lab ? (
                <>
                  Cell average {formatFigure(lab.mean, d.mean)}, s = {formatFigure(lab.sd, d.sd)}, h = {formatFigure(lab.h, 2)}, k = {formatFigure(lab.k, 2)}
                  {statistic && <> — <strong>{statistic}</strong></>}
                </>
              ) : null}
            </p>
            {photos.length > 0 ? (
              <div>
                <h3 className="mb-2 font-semibold text-basalt-800">Surface photos</h3>
                <ul className="grid grid-cols-2 gap-3">
                  {photos.map((p) => (
                    <li key={p.replicate}>
                      <a href={`/files/${p.photoFileId}`} target="_blank" rel="noreferrer">
                        <img src={`/files/${p.photoFileId}`} alt={`Surface of replicate ${p.replicate}, lab ${cell.lab}, ${cell.material}`} className="w-full rounded border border-basalt-200" />
                      </a>
                    </li>
                  ))}
                </ul>
              </div>
            ) : (
              <p className="text-basalt-700">The lab attached no surface photos to this cell.</p>
            )}
            {cellQueries.length > 0 && (
              <div>
                <h3 className="mb-2 font-semibold text-basalt-800">Queries on this cell</h3>
                <ul className="flex flex-col gap-2">
                  {cellQueries.map((q) => (
                    <li key={q.id} className="rounded border border-basalt-100 p-2">
                      <Badge tone={q.state === "closed" ? "leaf" : "ochre"}>{q.state}</Badge> {q.question}
                      {q.answer && (
                        <p className="mt-1">
                          <strong>Lab's answer:</strong> {q.answer}
                        </p>
                      )}
                    </li>
                  ))}
                </ul>
                <Link to={`/studies/${study.id}/queries`} className="text-basalt-700 underline">
                  All queries of the study
                </Link>
              </div>
            )}
          </div>
          <div className="flex flex-col gap-6">
            <AskTheLab loaderData={loaderData} actionData={actionData} cell={cell} statistic={statistic} />
            <DecisionForm loaderData={loaderData} actionData={actionData} cell={cell} currentlyExcluded={excluded} decision={decision ?? null} alpha={alpha} />
          </div>
        </div>
      )}
    </section>
  );
}

function errorsFor(actionData: ActionData, intent: string) {
  return actionData && !actionData.ok && actionData.intent === intent ? actionData : null;
}

function CellHiddenFields({ cell }: { cell: CellRef }) {
  return (
    <>
      <input type="hidden" name="lab" value={cell.lab} />
      <input type="hidden" name="material" value={cell.material} />
      <input type="hidden" name="response" value={cell.response} />
    </>
  );
}

function AskTheLab({ loaderData, actionData, cell, statistic }: { loaderData: LoaderData; actionData: ActionData; cell: CellRef; statistic: string }) {
  const failed = errorsFor(actionData, "ask");
  const navigation = useNavigation();
  if (loaderData.queryRefusal) return <Notice>{loaderData.queryRefusal}</Notice>;
  return (
    <Form method="post" className="flex flex-col gap-3" aria-labelledby="ask-heading">
      <h3 id="ask-heading" className="font-semibold text-basalt-800">
        Ask the lab
      </h3>
      {failed?.errors.form && <Notice tone="error">{failed.errors.form}</Notice>}
      <input type="hidden" name="intent" value="ask" />
      <CellHiddenFields cell={cell} />
      <div className="flex flex-col gap-1">
        <label htmlFor="field-statistic" className="font-semibold text-basalt-800">
          Statistic quoted
        </label>
        <input id="field-statistic" name="statistic" defaultValue={failed?.values.statistic ?? statistic} className="min-h-11 rounded-md border border-basalt-200 bg-white px-3 py-2" />
      </div>
      <label className="inline-flex min-h-11 items-center gap-2">
        <input type="checkbox" name="asksCorrection" className="size-5" defaultChecked={failed?.values.asksCorrection === "on"} />
        Ask the lab to correct this cell if it finds a recording error (it may amend this cell, with a reason, until you close the query)
      </label>
      <TextAreaField name="question" label="Question to the lab" error={failed?.errors.question} defaultValue={failed?.values.question ?? suggestedQuestion(cell, statistic || "see the attached statistic")} />
      <div>
        <Button type="submit" disabled={navigation.state === "submitting"}>
          Send the query
        </Button>
      </div>
    </Form>
  );
}

function DecisionForm({
  loaderData,
  actionData,
  cell,
  currentlyExcluded,
  decision,
  alpha,
}: {
  loaderData: LoaderData;
  actionData: ActionData;
  cell: CellRef;
  currentlyExcluded: boolean;
  decision: LoaderData["decisions"][number] | null;
  alpha: number;
}) {
  const failed = errorsFor(actionData, "decide");
  const preview = useFetcher<StudyAnalysis>();
  const [choice, setChoice] = useState<string>(failed?.values.decision ?? decision?.decision ?? "");
  if (loaderData.decisionRefusal) return <Notice>{loaderData.decisionRefusal}</Notice>;
  const others = loaderData.analysis.excluded.filter((e) => !sameCell(e, cell));
  const loadPreview = (value: string) => {
    setChoice(value);
    const list = value === "excluded" ? [...others, cell] : others;
    preview.load(`/api/v1/studies/${loaderData.study.id}/what-if?alpha=${alpha}&exclude=${encodeURIComponent(list.map(cellKey).join(","))}`);
  };
  const after = preview.data && "groups" in preview.data ? preview.data : null;
  return (
    <Form method="post" className="flex flex-col gap-3" aria-labelledby="decide-heading">
      <h3 id="decide-heading" className="font-semibold text-basalt-800">
        Cell decision
      </h3>
      <p className="text-sm text-basalt-700">
        {decision
          ? `Currently ${decision.decision}, decided by ${decision.decidedBy} on ${decision.decidedAt.slice(0, 10)}: ${decision.reason}`
          : "No decision yet: the cell counts in the figures."}
      </p>
      {failed?.errors.form && <Notice tone="error">{failed.errors.form}</Notice>}
      <input type="hidden" name="intent" value="decide" />
      <CellHiddenFields cell={cell} />
      <fieldset aria-describedby={failed?.errors.decision ? "field-decision-error" : undefined}>
        <legend className="mb-1 font-semibold text-basalt-800">Decision</legend>
        <div className="flex flex-wrap gap-4">
          {(["retained", "excluded"] as const).map((value) => (
            <label key={value} className="inline-flex min-h-11 items-center gap-2">
              <input type="radio" name="decision" value={value} checked={choice === value} onChange={() => loadPreview(value)} className="size-5" />
              {value === "retained" ? "Retain the cell" : "Exclude the cell"}
            </label>
          ))}
        </div>
        {failed?.errors.decision && (
          <p id="field-decision-error" className="text-sm font-semibold text-signal-700">
            {failed.errors.decision}
          </p>
        )}
      </fieldset>
      <TextAreaField
        name="reason"
        label="Reason"
        hint="The assignable cause the lab confirmed, or the statistical justification."
        error={failed?.errors.reason}
        defaultValue={failed?.values.reason ?? ""}
      />
      <div aria-live="polite">
        {preview.state === "loading" && <p>Recomputing…</p>}
        {after && choice && (
          <BeforeAfter
            before={findGroup(loaderData.analysis, cell)}
            after={findGroup(after, cell)}
            decimals={loaderData.responses.find((r) => r.key === cell.response)?.decimals ?? 0}
            changed={(choice === "excluded") !== currentlyExcluded}
          />
        )}
      </div>
      <div>
        {choice === "excluded" && !currentlyExcluded ? (
          <ConfirmStep
            label="Save decision"
            title={`Exclude lab ${cell.lab}, ${cell.material}, ${cell.response}?`}
            consequences={
              <>
                <p>The cell leaves the precision figures; the before-and-after figures are shown on this page. The reason is kept with the decision and shown to the committee.</p>
                <p>An excluded cell is reported in the statement as left out.</p>
              </>
            }
            confirmLabel="Exclude the cell"
            variant="danger"
          />
        ) : (
          <Button type="submit">Save decision</Button>
        )}
      </div>
    </Form>
  );
}

function BeforeAfter({ before, after, decimals, changed }: { before: ReturnType<typeof findGroup>; after: ReturnType<typeof findGroup>; decimals: number; changed: boolean }) {
  if (!changed) return <p>This keeps the cell as it is now; the figures do not change.</p>;
  const d = figureDecimals(decimals);
  const value = (g: ReturnType<typeof findGroup>, pick: (c: ComputedGroup) => number | null, digits: number) =>
    g?.status === "computed" ? formatFigure(pick(g), digits) : "not computed";
  const flaggedLabs = (g: ReturnType<typeof findGroup>) => g?.labs.filter((l) => l.flags.length > 0).map((l) => `${l.lab} (${l.flags.join(", ")})`).join(", ") || "none";
  const rows: [string, (g: ReturnType<typeof findGroup>) => string | number][] = [
    ["Labs p", (g) => g?.p ?? 0],
    ["x̿", (g) => value(g, (c) => c.mean, d.mean)],
    ["s_r", (g) => value(g, (c) => c.sr, d.sd)],
    ["s_R", (g) => value(g, (c) => c.sR, d.sd)],
    ["r", (g) => value(g, (c) => c.r, d.limit)],
    ["R", (g) => value(g, (c) => c.R, d.limit)],
    ["h critical", (g) => value(g, (c) => c.hCritical, 2)],
    ["k critical", (g) => value(g, (c) => c.kCritical, 2)],
    ["Flagged labs", flaggedLabs],
  ];
  return (
    <div>
      <h4 className="mb-1 font-semibold text-basalt-800">Before and after this decision (not saved yet)</h4>
      <SimpleTable caption="Figures of this material and response before and after the decision" headers={["Figure", "Now", "With this decision"]} rows={rows.map(([label, pick]) => [label, pick(before), pick(after)])} />
    </div>
  );
}

function Decisions({ loaderData }: { loaderData: LoaderData }) {
  const { history } = loaderData;
  return (
    <Card title="Decisions and their trail">
      {history.length === 0 ? (
        <p>No cell decision yet: every submitted cell counts in the figures.</p>
      ) : (
        <SimpleTable
          caption="Audit trail of cell decisions, newest first"
          headers={["When", "Who", "Cell", "Decision", "Reason"]}
          rows={history.map((h) => [
            h.at.replace("T", " ").slice(0, 16),
            h.by,
            cellKey(h.after),
            h.before ? `${h.before.decision} → ${h.after.decision}` : h.after.decision,
            h.reason,
          ])}
        />
      )}
    </Card>
  );
}
