import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useEffect, useMemo, useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/analysis";
import { DesignWarnings, ScreeningSteps, SignificanceEffect } from "~/components/analysis-warnings";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { MaterialPicker } from "~/components/material-picker";
import { PrecisionUncertainty } from "~/components/precision-uncertainty";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { PrecisionTables } from "~/components/precision-tables";
import { StateBadge } from "~/components/state-badge";
import { StudyDownloads } from "~/components/study-downloads";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice, RadioField, SimpleTable, TextAreaField } from "~/components/ui";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { blindingRefusals } from "~/lib/blinding";
import { formatDate, formatDateTime } from "~/lib/format";
import { studyPageMeta } from "~/lib/study-page-meta";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";
// The engine itself is loaded only with the exclusion preview (see useWhatIfEngine): import its parts, not its index.
import type { ComputedGroup, Finding, GroupResult } from "~/lib/precision";
import { isSignificanceLevel, SIGNIFICANCE_LEVELS } from "~/lib/precision/significance";
import { type CellRef, cellKey, parseCellList, sameCell } from "~/lib/review/cells";
import { flaggedCells, flagStatistic, suggestedQuestion } from "~/lib/review/flags";
import { ALPHA_LABEL, figureDecimals, formatFigure } from "~/lib/review/format";
import { labsOfOneMaterial, shownMaterial } from "~/lib/shown-material";
import { writeRefusal } from "~/lib/write-rules";
import { ConfirmStep } from "~/components/confirm-dialog";
import { Caution } from "~/components/cautions";
import { QUERY_STATE } from "~/lib/state-labels";
import { materialResults, studyAnalysis, withdrawnLabCodes } from "~/models/analysis.server";
import { listStudyQueries, raiseQuery } from "~/models/coordinator-queries.server";
import { amendedAfterQueryCells, cellEvidence, decisionHistory, listCellDecisions, saveCellDecision } from "~/models/decisions.server";
import { AmendedAfterQueryBadge } from "~/components/amended-badge";
import { studyDesign } from "~/models/statement.server";
import { studyIdentities } from "~/models/blinding.server";

export const handle = { pageTitle: "Analysis" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

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
  const [analysis, withdrawn, design, decisions, history, queries, evidence, amendedCells] = await Promise.all([
    studyAnalysis(study, { alpha }),
    withdrawnLabCodes(study.id),
    studyDesign(study.id),
    listCellDecisions(study.id),
    decisionHistory(study.id),
    listStudyQueries(study.id),
    cell ? cellEvidence(study.id, cell) : [],
    amendedAfterQueryCells(study.id),
  ]);
  // One material's lab tables and charts at a time: a large study's every table at once is too much for a tablet.
  const material = shownMaterial(cell?.material ?? url.searchParams.get("material"), design.materials);
  const decisionRefusal = writeRefusal("decisions", study.state);
  return {
    study: { id: study.id, code: study.code, title: study.title, state: study.state, dataVersion: study.dataVersion },
    alpha,
    material,
    analysis: labsOfOneMaterial(analysis, material),
    withdrawn,
    ...design,
    decisions,
    history,
    queries: queries.map(({ labName: _labName, ...q }) => q),
    flagged: flaggedCells(analysis),
    cell,
    cellEvidence: evidence,
    amendedCells,
    // The results the page recomputes a decision's effect from, before it is saved.
    whatIf: cell && !decisionRefusal ? await materialResults(study, cell.material, alpha) : null,
    decisionRefusal,
    queryRefusal: writeRefusal("queries", study.state),
  };
}

const cellField = z.string({ message: "Choose a cell." }).trim().min(1, "Choose a cell.");
const cellFields = { lab: cellField, material: cellField, response: cellField };
const QUESTION_TOO_SHORT = "Write the question for the lab (at least 10 characters).";
const REASON_TOO_SHORT = "Give the reason (at least 10 characters): the assignable cause or the statistical justification.";

const askSchema = z.object({
  intent: z.literal("ask"),
  ...cellFields,
  statistic: z.string().trim().max(800, "Keep the statistic under 800 characters.").default(""),
  question: z.string({ message: QUESTION_TOO_SHORT }).trim().min(10, QUESTION_TOO_SHORT).max(2000, "Keep the question under 2000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })),
  // A checkbox: present means the lab may amend the cell while the query is open.
  asksCorrection: z.literal("on").optional(),
});

const decideSchema = z.object({
  intent: z.literal("decide"),
  ...cellFields,
  decision: z.enum(["retained", "excluded"], { message: "Choose retain or exclude." }),
  reason: z.string({ message: REASON_TOO_SHORT }).trim().min(10, REASON_TOO_SHORT).max(2000, "Keep the reason under 2000 characters.").superRefine(refuseUnsafeCharacters({ multiline: true })),
});

const analysisSchema = z.discriminatedUnion("intent", [askSchema, decideSchema], { error: "Unknown action." });

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: analysisSchema });
  if (submission.status !== "success") return refuse(submission);
  const form = submission.value;
  // The committee reads reasons and queries word for word: refuse any that would unblind a lab.
  const texts: Record<string, string> = form.intent === "ask" ? { question: form.question, statistic: form.statistic } : { reason: form.reason };
  const unblinding = blindingRefusals(texts, await studyIdentities(study.id));
  if (unblinding) return refuse(submission, unblinding);
  // A refusal here is a conflict with the study's state or data (409), shown above the form.
  const outcome = await withRefusals(
    submission,
    async () => {
      if (form.intent === "ask") {
        const { intent: _, asksCorrection, ...query } = form;
        await raiseQuery(study, user.id, { ...query, asksCorrection: asksCorrection === "on" }, request);
        return `Query sent to lab ${query.lab}.`;
      }
      const { intent: _, ...decision } = form;
      await saveCellDecision(study, user.id, decision);
      return `Cell ${cellKey(decision)} ${decision.decision}. Re-check the flags below before deciding on another cell.`;
    },
    409,
  );
  if (!outcome.ok) return outcome.reply;
  const url = new URL(request.url);
  return redirectWithToast(url.pathname + url.search, outcome.value);
}

type LoaderData = Route.ComponentProps["loaderData"];
type ActionData = Route.ComponentProps["actionData"];
type Decision = LoaderData["decisions"][number];

const cellHref = (alpha: number, cell: CellRef) => `?alpha=${alpha}&material=${encodeURIComponent(cell.material)}&cell=${encodeURIComponent(cellKey(cell))}#investigate`;

export default function Analysis({ loaderData, actionData }: Route.ComponentProps) {
  const { study, analysis, responses, alpha, decisions, cell, material, materials } = loaderData;
  const excludedKeys = new Set(decisions.filter((d) => d.decision === "excluded").map(cellKey));
  return (
    <>
      <div className="flex flex-col gap-6">
        <p className="text-basalt-700">Data version {study.dataVersion}.</p>
        <Caution id="exclusion" summary="Before leaving any result out: a flag only starts an investigation">
          Exclude a cell only when there is an assignable cause (a batching, testing or recording fault the lab confirms) or a clear statistical
          justification, give that reason, and look at the flags again after every exclusion — removing one cell changes the critical values and
          statistics of the others. These figures support the committee's judgement; they do not replace it.
        </Caution>
        <DesignWarnings warnings={analysis.warnings} />
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
            {material && <input type="hidden" name="material" value={material} />}
            {cell && <input type="hidden" name="cell" value={cellKey(cell)} />}
            <Button type="submit" variant="secondary">
              Recompute
            </Button>
          </Form>
          <SignificanceEffect text={analysis.significance} />
        </Card>
        <FlaggedCells loaderData={loaderData} excludedKeys={excludedKeys} />
        {cell && <Investigation key={cellKey(cell)} loaderData={loaderData} actionData={actionData} cell={cell} />}
        <Card title="Tables">
          <StudyDownloads studyId={study.id} what="analysis" query={`?alpha=${alpha}`} />
          <div className="mb-4">
            <MaterialPicker materials={materials} shown={material} drop={["cell"]} />
          </div>
          <PrecisionTables
            analysis={analysis}
            responses={responses}
            headingLevel={3}
            material={material}
            labAction={(group, lab) => (
              <>
                <AmendedAfterQueryBadge cell={{ lab: lab.lab, material: group.material, response: group.response }} amended={loaderData.amendedCells} />{" "}
                <Link to={cellHref(alpha, { lab: lab.lab, material: group.material, response: group.response })} className="font-semibold text-basalt-700 underline">
                  {lab.findings.length > 0 ? "Ask the lab / decide" : "Decide"}
                  <span className="sr-only">
                    {" "}
                    on lab {lab.lab}, {group.material}, {group.response}
                  </span>
                </Link>
              </>
            )}
          />
        </Card>
        <Card title={material ? `Charts of ${material}` : "Charts"}>
          <LazyCharts analysis={analysis} responses={responses} tableOnOpen />
        </Card>
        <Card title="Uncertainty of the figures">
          <PrecisionUncertainty analysis={analysis} responses={responses} />
        </Card>
        <Decisions loaderData={loaderData} />
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
                {f.lab} <AmendedAfterQueryBadge cell={f} amended={loaderData.amendedCells} />
              </span>,
              f.material,
              f.response,
              f.statistic,
              query ? <StateBadge key="q" view={QUERY_STATE[query.state]} /> : "none",
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

function findGroup(groups: readonly GroupResult[], cell: CellRef) {
  return groups.find((g) => g.material === cell.material && g.response === cell.response) ?? null;
}

function Investigation({ loaderData, actionData, cell }: { loaderData: LoaderData; actionData: ActionData; cell: CellRef }) {
  const { analysis, responses, cellEvidence, decisions, queries, study } = loaderData;
  const response = responses.find((r) => r.key === cell.response);
  const group = findGroup(analysis.groups, cell);
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
        Investigate lab {cell.lab} · {cell.material} · {response?.name ?? cell.response} <AmendedAfterQueryBadge cell={cell} amended={loaderData.amendedCells} />
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
                        <img src={`/files/${p.photoFileId}?thumbnail`} alt={`Surface of replicate ${p.replicate}, lab ${cell.lab}, ${cell.material}`} className="w-full rounded border border-basalt-200" />
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
                      <StateBadge view={QUERY_STATE[q.state]} /> {q.question}
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
            {group?.status === "computed" && (
              <div>
                <h3 className="mb-2 font-semibold text-basalt-800">Screening of {cell.material} · {cell.response}, in ISO 5725-2's order</h3>
                <ScreeningSteps group={group} />
              </div>
            )}
            <AskTheLab loaderData={loaderData} actionData={actionData} cell={cell} statistic={statistic} findings={lab?.findings ?? []} />
            <DecisionForm loaderData={loaderData} actionData={actionData} cell={cell} currentlyExcluded={excluded} decision={decision ?? null} />
          </div>
        </div>
      )}
    </section>
  );
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

function AskTheLab({
  loaderData,
  actionData,
  cell,
  statistic,
  findings,
}: {
  loaderData: LoaderData;
  actionData: ActionData;
  cell: CellRef;
  statistic: string;
  findings: Finding[];
}) {
  const navigation = useNavigation();
  const [form, fields] = useSchemaForm(askSchema, {
    reply: actionData,
    intent: "ask",
    defaultValue: { statistic, question: suggestedQuestion(cell, statistic || "see the attached statistic", findings) },
  });
  if (loaderData.queryRefusal) return <Notice>{loaderData.queryRefusal}</Notice>;
  return (
    <Form method="post" className="flex flex-col gap-3" aria-labelledby="ask-heading" {...getFormProps(form)}>
      <h3 id="ask-heading" className="font-semibold text-basalt-800">
        Ask the lab
      </h3>
      <FormErrors errors={[...formWideErrors(form), ...(fields.lab.errors ?? [])]} />
      <input type="hidden" name="intent" value="ask" />
      <CellHiddenFields cell={cell} />
      <Field label="Statistic quoted" {...fieldProps(fields.statistic)} />
      <label className="inline-flex min-h-11 items-center gap-2">
        <input type="checkbox" name={fields.asksCorrection.name} className="size-5" defaultChecked={fields.asksCorrection.initialValue === "on"} />
        Ask the lab to correct this cell if it finds a recording error (it may amend this cell, with a reason, until you close the query)
      </label>
      <TextAreaField label="Question to the lab" {...fieldProps(fields.question)} />
      <div>
        <Button type="submit" disabled={navigation.state === "submitting"}>
          Send the query
        </Button>
      </div>
    </Form>
  );
}

const DECISIONS = [
  { value: "retained", label: "Retain the cell" },
  { value: "excluded", label: "Exclude the cell" },
];

function DecisionForm({
  loaderData,
  actionData,
  cell,
  currentlyExcluded,
  decision,
}: {
  loaderData: LoaderData;
  actionData: ActionData;
  cell: CellRef;
  currentlyExcluded: boolean;
  decision: Decision | null;
}) {
  const [form, fields] = useSchemaForm(decideSchema, { reply: actionData, intent: "decide" });
  const [choice, setChoice] = useState<string>((fields.decision.initialValue as string | undefined) ?? decision?.decision ?? "");
  const engine = useWhatIfEngine();
  const { whatIf, decisionRefusal } = loaderData;
  const saved = loaderData.analysis.excluded;
  // The preview is recomputed here, by the engine the server runs; saving recomputes on the server.
  const after = useMemo(() => {
    if (!engine || !whatIf || (choice !== "retained" && choice !== "excluded")) return null;
    const start = performance.now();
    const groups = engine.materialWhatIf(whatIf, engine.exclusionsWith(saved, cell, choice));
    performance.measure("what-if recompute", { start, end: performance.now() });
    return groups;
  }, [engine, whatIf, saved, cell, choice]);
  if (decisionRefusal || !whatIf) return <Notice>{decisionRefusal}</Notice>;
  return (
    <Form method="post" className="flex flex-col gap-3" aria-labelledby="decide-heading" {...getFormProps(form)}>
      <h3 id="decide-heading" className="font-semibold text-basalt-800">
        Cell decision
      </h3>
      <p className="text-sm text-basalt-700">
        {decision
          ? `Currently ${decision.decision}, decided by ${decision.decidedBy} on ${formatDate(decision.decidedAt)}: ${decision.reason}`
          : "No decision yet: the cell counts in the figures."}
      </p>
      <FormErrors errors={[...formWideErrors(form), ...(fields.lab.errors ?? [])]} />
      <input type="hidden" name="intent" value="decide" />
      <CellHiddenFields cell={cell} />
      <RadioField label="Decision" options={DECISIONS} {...fieldProps(fields.decision)} value={choice} onChange={setChoice} />
      <TextAreaField label="Reason" hint="The assignable cause the lab confirmed, or the statistical justification." {...fieldProps(fields.reason)} />
      <div aria-live="polite">
        {after && choice && (
          <BeforeAfter
            before={findGroup(loaderData.analysis.groups, cell)}
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

/** The precision engine, fetched once a cell is open for a decision rather than with the page. */
function useWhatIfEngine() {
  const [engine, setEngine] = useState<typeof import("~/lib/review/what-if") | null>(null);
  useEffect(() => {
    let current = true;
    import("~/lib/review/what-if").then((module) => current && setEngine(module));
    return () => {
      current = false;
    };
  }, []);
  return engine;
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
            formatDateTime(h.at),
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
