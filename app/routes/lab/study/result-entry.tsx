import type { SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { lazy, Suspense, useEffect } from "react";
import { data, Form, isRouteErrorResponse, Link, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/result-entry";
import { CellStatusBadge } from "~/components/cell-status-badge";
import { ConcreteCaution } from "~/components/cautions";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Button, Card, Field, Notice } from "~/components/ui";
import { formatDateTime } from "~/lib/format";
import { PhotoThumbnail } from "~/components/photo-thumbnail";
import { draftChanges, rebaseDraft } from "~/lib/results/entry-draft";
import {
  type DraftChanges,
  draftProblems,
  type EntryDraft,
  entryDraftSchema,
  PHOTO_MAX_BYTES,
  PHOTO_TOO_LARGE,
  resultEntrySchema,
} from "~/lib/results/entry-forms";
import { checkFreshReading, FRESH_FIELDS, FRESH_PROPERTY_NAMES, type FreshProperty } from "~/lib/results/fresh";
import { SAVE_STATE_TEXT, useAutosavedDraft } from "~/lib/results/use-autosaved-draft";
import { checkResultValue, checkTestDate } from "~/lib/results/values";
import { studyPageMeta } from "~/lib/study-page-meta";
import { freshTargets, getBatch, saveFreshProperties } from "~/models/batch.server";
import { writeRefusal } from "~/lib/write-rules";
import { correctableResponses, openQueriesOfMaterial } from "~/models/lab-queries.server";
import {
  amendResult,
  attachReplicatePhotoOrRefusal,
  type Enrollment,
  materialEntry,
  ResultsError,
  type ResultInputRow,
  saveDraftResults,
  type UnusualValue,
  submitMaterial,
} from "~/models/results.server";
import { refuse } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { photoAdded } from "~/lib/results/entry-forms";
import { readUploadForm } from "~/server/upload-form.server";

// The photo and amendment forms bring the form library with them; the grid and its autosave, what an
// analyst needs first, do without it, so those forms arrive in a chunk of their own after the page.
const laterForms = () => import("~/components/result-entry-forms");
const PhotoCell = lazy(() => laterForms().then((module) => ({ default: module.PhotoCell })));
const AmendForm = lazy(() => laterForms().then((module) => ({ default: module.AmendForm })));
const AmendFreshForm = lazy(() => laterForms().then((module) => ({ default: module.AmendFreshForm })));

const pageTitle = (data: { material: { code: string } }) => `Results of ${data.material.code}`;

export const handle: StudyPageHandle<{ material: { code: string } }> = { pageTitle };

export const meta: Route.MetaFunction = ({ data, matches }) => studyPageMeta(data ? pageTitle(data) : "Results", matches);

async function loadEntry(context: Route.LoaderArgs["context"], params: Route.LoaderArgs["params"]) {
  const access = requireStudy(context, ["analyst"]);
  const enrollment = access.enrollment!;
  const entry = await materialEntry(enrollment, Number(params.materialId));
  if (!entry) notFound();
  return { ...access, enrollment, entry };
}

type Entry = NonNullable<Awaited<ReturnType<typeof materialEntry>>>;
type Batch = Awaited<ReturnType<typeof getBatch>>;

const text = (n: number | null | undefined) => (n === null || n === undefined ? "" : String(n));

/** The draft as stored on the server, in the form's shape. */
function serverDraft(entry: Entry, batch: Batch, replicates: number): EntryDraft {
  const draft: EntryDraft = { values: {}, testedOn: {}, operator: {}, fresh: {}, batchedAt: batch?.batchedAt ?? "", versions: {} };
  for (const response of entry.responses) {
    for (const r of response.results) {
      draft.values[`${response.key}:${r.replicate}`] = text(r.value);
      draft.versions[`${response.key}:${r.replicate}`] = r.version;
      if (r.testedOn) draft.testedOn[r.replicate] ??= r.testedOn;
      if (r.operator) draft.operator[r.replicate] ??= r.operator;
    }
  }
  for (let replicate = 1; replicate <= replicates; replicate++) {
    draft.testedOn[replicate] ??= "";
    draft.operator[replicate] ??= "";
  }
  for (const property of FRESH_PROPERTY_NAMES) draft.fresh[property] = text(batch?.[FRESH_FIELDS[property].column]);
  return draft;
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { study, enrollment, entry } = await loadEntry(context, params);
  const [batch, targets, openQueries, correctable] = await Promise.all([
    getBatch(enrollment.id, entry.material.id),
    freshTargets(study.id),
    openQueriesOfMaterial(enrollment, entry.material.id),
    correctableResponses(enrollment, entry.material.id),
  ]);
  const photos: Record<number, number> = {};
  for (const response of entry.responses) for (const r of response.results) if (r.photoAttachmentId) photos[r.replicate] = r.photoAttachmentId;
  return {
    study: { id: study.id, state: study.state, replicatesPerCell: study.replicatesPerCell },
    // A float finishing study (it has a target surface rating) photographs the finished surface; other methods just a photo.
    photoLabel: study.targetSurfaceRating === null ? "Photo" : "Surface photo",
    editable: study.state === "testing" && enrollment.state === "accepted",
    /** Why nothing can be typed here, as the write rules say it. */
    lockedBecause: writeRefusal("results", study.state),
    /** After testing, the responses whose cell a correction query lets the lab amend. */
    correctable: study.state === "checking" && enrollment.state === "accepted" ? correctable : [],
    enrollmentId: enrollment.id,
    material: { id: entry.material.id, code: entry.material.code, description: entry.material.description },
    responses: entry.responses.map(({ results: _results, ...response }) => response),
    submittedValues: Object.fromEntries(entry.responses.flatMap((r) => r.results.map((x) => [`${r.key}:${x.replicate}`, x.value]))),
    draft: serverDraft(entry, batch, study.replicatesPerCell),
    targets,
    photos,
    openQueries,
  };
}

/**
 * Saves what changed: replicates of cells still in draft (each checked
 * against the version it was read at) and the changed fresh properties.
 * Returns the problems and the conflicts keyed by the field that shows them.
 */
async function saveChanges(enrollment: Enrollment, entry: Entry, changes: DraftChanges, user: { id: number }) {
  const submittedKeys = new Set(entry.responses.filter((r) => r.cell?.status === "submitted").map((r) => r.key));
  const sent = changes.rows.filter((r) => !submittedKeys.has(r.response));
  const rows: ResultInputRow[] = sent.map((r, i) => ({ row: i + 1, material: entry.material.code, ...r }));
  const outcome = await saveDraftResults(enrollment, rows, user);
  const problems: Record<string, string> = {};
  const conflicts: Record<string, string> = {};
  const fieldOf = (row: number) => sent[row - 1]!;
  for (const p of outcome.problems) {
    const { response, replicate } = fieldOf(p.row);
    const key = p.field === "tested_on" ? `testedOn:${replicate}` : p.field === "operator" ? `operator:${replicate}` : `${response}:${replicate}`;
    problems[key] ??= p.message;
  }
  for (const c of outcome.conflicts) conflicts[`${fieldOf(c.row).response}:${c.replicate}`] = c.message;
  const locked = entry.responses.every((r) => r.cell?.status === "submitted");
  const freshChanged = Object.keys(changes.fresh).length > 0 || changes.batchedAt !== undefined;
  if (!locked && freshChanged) {
    const fresh = await saveFreshProperties(enrollment, entry.material.id, { ...changes.fresh, ...(changes.batchedAt !== undefined ? { batchedAt: changes.batchedAt } : {}) }, user);
    for (const [property, message] of Object.entries(fresh.problems)) problems[`fresh:${property}`] = message;
  }
  return { problems, conflicts };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, study, enrollment, entry } = await loadEntry(context, params);
  const here = `/lab/studies/${study.id}/results/${entry.material.id}`;
  const upload = await readUploadForm(request, "photo", PHOTO_MAX_BYTES);
  // Only the photo form sends a file; the body was not read past it.
  if (upload.tooLarge) return data({ result: PHOTO_TOO_LARGE_REPLY }, { status: 413 });
  const submission = parseWithZod(upload.formData, { schema: resultEntrySchema });
  if (submission.status !== "success") return refuse(submission);
  const input = submission.value;
  switch (input.intent) {
    case "draft": {
      const saved = await saveChangesOrRefuse(enrollment, entry, input.draft, user);
      if (!saved.ok) return refuse(submission, { form: [saved.message] });
      return { ...saved.value, stamp: await currentStamp(enrollment, entry, study.replicatesPerCell) };
    }
    case "submit": {
      const saved = await saveChangesOrRefuse(enrollment, entry, input.draft, user);
      if (!saved.ok) return refuse(submission, { form: [saved.message] });
      const { problems, conflicts } = saved.value;
      if (Object.keys(conflicts).length > 0) {
        return data(
          {
            result: submission.reply({ formErrors: ["Someone else changed a value meanwhile; check the marked fields, then submit again."] }),
            problems,
            conflicts,
            stamp: await currentStamp(enrollment, entry, study.replicatesPerCell),
          },
          { status: 409 },
        );
      }
      if (Object.keys(problems).length > 0) {
        return data({ result: submission.reply({ formErrors: ["Correct the marked fields first."] }), problems }, { status: 400 });
      }
      const submitted = await submitMaterial(enrollment, entry.material.id, user, { confirmedUnusual: input.confirmUnusual === "yes" });
      if (!submitted.ok) return data({ result: submission.reply({ formErrors: submitted.problems }), unusualValues: submitted.unusual ?? [] }, { status: 400 });
      return redirectWithToast(here, `${entry.material.code} is submitted. Thank you.`);
    }
    case "amend": {
      const { responseId, replicate, version, value, reason, confirmUnusual } = input;
      try {
        const outcome = await amendResult(enrollment, entry.material.id, { responseId, replicate, value, reason, expectedVersion: version, confirmedUnusual: confirmUnusual === "yes" }, user);
        if (!outcome.ok) {
          return data({ result: submission.reply({ fieldErrors: { [outcome.field]: [outcome.message] } }), unusual: outcome.unusual ?? false }, { status: outcome.field === "form" ? 409 : 400 });
        }
      } catch (error) {
        if (error instanceof ResultsError) return refuse(submission, { form: [error.message] });
        throw error;
      }
      return redirectWithToast(here, "Amendment recorded. The coordinator sees the old and the new value with your reason.");
    }
    case "amend-fresh": {
      const { intent: _, reason, ...readings } = input;
      let outcome: Awaited<ReturnType<typeof saveFreshProperties>>;
      try {
        outcome = await saveFreshProperties(enrollment, entry.material.id, readings as Partial<Record<FreshProperty, string>>, user, { reason: reason ?? "" });
      } catch (error) {
        if (error instanceof ResultsError) return refuse(submission, { form: [error.message] });
        throw error;
      }
      const problems = Object.entries(outcome.problems as Record<string, string>);
      if (problems.length > 0) return refuse(submission, Object.fromEntries(problems.map(([field, message]) => [field, [message]])));
      return redirectWithToast(here, "Fresh properties amended. The coordinator sees the old and the new readings with your reason.");
    }
    case "photo": {
      // Without scripts the photo comes here; with them it goes to the upload route beside this page, which shows its progress.
      const refusal = await attachReplicatePhotoOrRefusal(enrollment, entry.material.id, input.replicate, input.photo, user);
      if (refusal) return refuse(submission, { photo: [refusal] });
      return redirectWithToast(here, photoAdded(input.replicate));
    }
  }
}

/** The server's draft after a save, for the page to fold into what is on screen. */
async function currentStamp(enrollment: Enrollment, entry: Entry, replicates: number) {
  const current = await materialEntry(enrollment, entry.material.id);
  return JSON.stringify(serverDraft(current!, await getBatch(enrollment.id, entry.material.id), replicates));
}

/** Saves the changes; a study no longer open to changes (a ResultsError) refuses the whole form. */
async function saveChangesOrRefuse(enrollment: Enrollment, entry: Entry, changes: DraftChanges, user: { id: number }) {
  try {
    return { ok: true as const, value: await saveChanges(enrollment, entry, changes, user) };
  } catch (error) {
    if (error instanceof ResultsError) return { ok: false as const, message: error.message };
    throw error;
  }
}

const PHOTO_TOO_LARGE_REPLY: SubmissionResult<string[]> = { status: "error", error: { photo: [PHOTO_TOO_LARGE] } };

/**
 * A request that never reached the server answers `offline` instead of
 * replacing the page with an error, so nothing typed is lost; a photo the
 * server's body cap refused (413, before the app reads it) is named beside
 * its replicate like any other refusal of it.
 */
export async function clientAction({ serverAction }: Route.ClientActionArgs) {
  try {
    return await serverAction();
  } catch (error) {
    if (isRouteErrorResponse(error) && error.status === 413) return { result: PHOTO_TOO_LARGE_REPLY };
    // A redirect (a photo added, a material submitted) and the page's own errors go on as the framework means them.
    if (error instanceof Response || isRouteErrorResponse(error)) throw error;
    return { offline: true as const };
  }
}

// A draft save changes nothing else the page shows, so the page is not reloaded after one.
export function shouldRevalidate({ formData, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formData?.get("intent") === "draft" ? false : defaultShouldRevalidate;
}

type ActionData = Route.ComponentProps["actionData"];

/** A cell of the entry table; on a phone, one labelled field of the replicate's card. */
const ENTRY_CELL = "px-2 py-2 max-sm:block max-sm:p-0";

export default function ResultEntry({ loaderData, actionData }: Route.ComponentProps) {
  const { study, material, responses, targets, photos, openQueries, editable } = loaderData;
  const replicates = Array.from({ length: study.replicatesPerCell }, (_, i) => i + 1);
  const locked = responses.every((r) => r.cell?.status === "submitted");
  const storageKey = `ringbatch:results-draft:${loaderData.enrollmentId}:${material.id}`;
  const responseKeys = responses.filter((r) => r.cell?.status !== "submitted").map((r) => r.key);
  const {
    draft,
    update,
    saveState,
    problems: savedProblems,
    conflicts: savedConflicts,
    forget,
    flush,
    base,
  } = useAutosavedDraft({
    storageKey,
    serverDraft: loaderData.draft,
    intent: "draft",
    schema: entryDraftSchema,
    changes: (from: EntryDraft, to: EntryDraft) => draftChanges(from, to, responseKeys, study.replicatesPerCell),
    rebase: rebaseDraft,
  });
  const submitReply = actionData && "result" in actionData && actionData.result?.initialValue?.intent === "submit" ? actionData : undefined;
  const submitProblems = submitReply && "problems" in submitReply ? (submitReply.problems as Record<string, string>) : undefined;
  const submitConflicts = submitReply && "conflicts" in submitReply ? (submitReply.conflicts as Record<string, string>) : undefined;
  const unusualValues = submitReply && "unusualValues" in submitReply ? (submitReply.unusualValues as UnusualValue[]) : [];
  const problems: Record<string, string> = { ...savedProblems, ...savedConflicts, ...submitProblems, ...submitConflicts, ...draftProblems(draft) };
  // The submitted draft is the grid's, checked as the analyst types (draftProblems); the action's refusal of the form as a whole shows here.
  const submitErrors = [...(submitReply?.result?.error?.[""] ?? []), ...(submitReply?.result?.error?.form ?? [])];

  useEffect(() => {
    if (locked) forget();
  }, [locked, forget]);

  const setValue = (key: string, value: string) => update({ ...draft, values: { ...draft.values, [key]: value } });
  const setReplicateField = (field: "testedOn" | "operator", replicate: number, value: string) =>
    update({ ...draft, [field]: { ...draft[field], [replicate]: value } });

  return (
    <>
      <div className="mb-6 flex flex-wrap items-center justify-between gap-3">
        <p>{material.description}</p>
        <div className="flex flex-wrap gap-x-4">
          {editable && !locked && (
            <Link to={`/lab/studies/${study.id}/import`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
              Fill in a spreadsheet instead
            </Link>
          )}
          <Link to={`/lab/studies/${study.id}`} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
            Back to the tasks
          </Link>
        </div>
      </div>
      <div className="grid gap-6 [&>*]:min-w-0">
        <ConcreteCaution />
        {!editable && loaderData.lockedBecause && <Notice>{loaderData.lockedBecause}</Notice>}
        {loaderData.correctable.length > 0 && (
          <Notice tone="caution">The coordinator asks your lab to correct a result of this material. Amend the named result below with the reason; the change is kept in the audit trail.</Notice>
        )}
        {openQueries.length > 0 && (
          <Notice tone="caution">
            The coordinator asks about this material:
            <ul className="ml-5 list-disc">
              {openQueries.map((q) => (
                <li key={q.id}>
                  {q.responseName}: {q.question}
                </li>
              ))}
            </ul>
            <Link to="/lab/queries" className="font-semibold underline">
              Answer in your queries
            </Link>
          </Notice>
        )}
        {!locked && editable && (
          <p role="status" aria-live="polite" className="sticky top-0 z-10 rounded-md bg-white px-3 py-2 font-semibold text-basalt-800 shadow-sm" data-testid="save-state">
            {SAVE_STATE_TEXT[saveState]}
          </p>
        )}

        <Card title="Fresh properties of the batch">
          <p className="mb-3 text-basalt-700">Out-of-tolerance readings are kept and marked for the coordinator; never discard the batch's results for them here.</p>
          <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {FRESH_PROPERTY_NAMES.map((property) => {
              const field = FRESH_FIELDS[property];
              const check = checkFreshReading(property, draft.fresh[property], targets[property]);
              const target = targets[property];
              const error = check.status === "refused" ? check.message : problems[`fresh:${property}`];
              return (
                <div key={property}>
                  <Field
                    label={`${field.label} (${field.unit})`}
                    name={`fresh-${property}`}
                    inputMode="decimal"
                    value={draft.fresh[property] ?? ""}
                    disabled={locked || !editable}
                    onChange={(e) => update({ ...draft, fresh: { ...draft.fresh, [property]: e.target.value } })}
                    hint={target ? `Target ${target.target} ± ${target.tolerance} ${field.unit}` : undefined}
                    error={error}
                  />
                  {check.status === "ok" && check.tolerance && !check.tolerance.withinTolerance && (
                    <p className="mt-1">
                      <Badge tone="signal">Outside tolerance</Badge> <span className="text-sm">kept and marked for the coordinator</span>
                    </p>
                  )}
                  {check.status === "ok" && check.warning && <p className="mt-1 text-sm text-ochre-800">{check.warning}</p>}
                </div>
              );
            })}
            <Field
              label="Time of batching"
              name="batchedAt"
              type="datetime-local"
              value={draft.batchedAt}
              disabled={locked || !editable}
              onChange={(e) => update({ ...draft, batchedAt: e.target.value })}
              error={problems["fresh:batchedAt"]}
            />
          </div>
        </Card>

        {locked && (editable || loaderData.correctable.length > 0) && (
          <Suspense>
            <AmendFreshForm fresh={loaderData.draft.fresh} actionData={actionData} />
          </Suspense>
        )}

        <Card title={locked ? "Submitted results" : "Results per replicate"}>
          {locked ? (
            <SubmittedResults
              photoLabel={loaderData.photoLabel}
              responses={responses}
              replicates={replicates}
              values={loaderData.submittedValues}
              actionData={actionData}
              editable={editable}
              correctable={loaderData.correctable}
              photos={photos}
            />
          ) : (
            // A table on wider screens; on a phone each replicate becomes a card with every field labelled.
            <div className="relative sm:overflow-x-auto" role="region" aria-label={`Replicate results of ${material.code}`} tabIndex={0} data-testid="entry-table">
              <table className="w-full border-collapse text-left max-sm:block">
                <caption className="sr-only">Replicate results of {material.code}</caption>
                <thead className="max-sm:hidden">
                  <tr className="border-b-2 border-basalt-200">
                    <th scope="col" className="px-2 py-2">
                      Replicate
                    </th>
                    {responses.map((r) => (
                      <th key={r.id} scope="col" className="px-2 py-2">
                        {r.name} {r.unit && <span className="font-normal">({r.unit})</span>}
                      </th>
                    ))}
                    <th scope="col" className="px-2 py-2">
                      Test date
                    </th>
                    <th scope="col" className="px-2 py-2">
                      Operator
                    </th>
                    <th scope="col" className="px-2 py-2">
                      {loaderData.photoLabel}
                    </th>
                  </tr>
                </thead>
                <tbody className="max-sm:grid max-sm:gap-3">
                  {replicates.map((replicate) => {
                    const date = checkTestDate(draft.testedOn[replicate]);
                    return (
                      <tr
                        key={replicate}
                        className="border-b border-basalt-100 align-top max-sm:grid max-sm:gap-3 max-sm:rounded-md max-sm:border max-sm:border-basalt-200 max-sm:p-3"
                        data-testid="replicate-card"
                      >
                        <th scope="row" className="px-2 py-2 max-sm:p-0 max-sm:text-lg">
                          <span className="sm:sr-only">Replicate </span>
                          {replicate}
                        </th>
                        {responses.map((response) => {
                          const key = `${response.key}:${replicate}`;
                          const check = checkResultValue(response, draft.values[key]);
                          return (
                            <td key={response.id} className={ENTRY_CELL}>
                              <CellInput
                                id={`value-${key}`}
                                label={`${response.name}, replicate ${replicate}`}
                                value={draft.values[key] ?? ""}
                                inputMode={response.kind === "count" ? "numeric" : "decimal"}
                                disabled={!editable}
                                onChange={(v) => setValue(key, v)}
                                error={check.status === "refused" ? check.message : problems[key]}
                                warning={check.status === "ok" ? check.warning : undefined}
                              />
                            </td>
                          );
                        })}
                        <td className={ENTRY_CELL}>
                          <CellInput
                            id={`testedOn-${replicate}`}
                            label={`Test date, replicate ${replicate}`}
                            type="date"
                            value={draft.testedOn[replicate] ?? ""}
                            disabled={!editable}
                            onChange={(v) => setReplicateField("testedOn", replicate, v)}
                            error={date.ok ? problems[`testedOn:${replicate}`] : date.message}
                          />
                        </td>
                        <td className={ENTRY_CELL}>
                          <CellInput
                            id={`operator-${replicate}`}
                            label={`Operator, replicate ${replicate}`}
                            wide
                            value={draft.operator[replicate] ?? ""}
                            disabled={!editable}
                            onChange={(v) => setReplicateField("operator", replicate, v)}
                            error={problems[`operator:${replicate}`]}
                          />
                        </td>
                        <td className={ENTRY_CELL}>
                          <Suspense>
                            <PhotoCell replicate={replicate} photoId={photos[replicate]} editable={editable} label={loaderData.photoLabel} />
                          </Suspense>
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          )}
        </Card>

        {!locked && editable && (
          <Card title={`Submit ${material.code}`}>
            <p className="mb-3">
              Submitting locks every result of {material.code}. After that a change is an amendment with a reason, which the coordinator sees.
            </p>
            <Form method="post" className="mt-3 grid gap-3" onSubmit={() => flush()}>
              {submitErrors.length > 0 && <Notice tone="error">{submitErrors.join(" ")}</Notice>}
              {unusualValues.length > 0 && (
                <Notice tone="caution">
                  <p className="font-semibold">Please look again at these values before submitting:</p>
                  <ul className="ml-5 list-disc" aria-label="Values outside the plausible range">
                    {unusualValues.map((u) => (
                      <li key={`${u.response}:${u.replicate}`}>
                        {u.response}, replicate {u.replicate}: <span className="font-semibold">{u.value}</span> (plausible {u.range})
                      </li>
                    ))}
                  </ul>
                  <p className="mt-2">If they are what your lab measured, confirm and submit; otherwise correct them above.</p>
                </Notice>
              )}
              <input type="hidden" name="intent" value="submit" />
              <input type="hidden" name="draft" value={JSON.stringify(draftChanges(base(), draft, responseKeys, study.replicatesPerCell))} />
              <div>
                {unusualValues.length > 0 ? (
                  <Button type="submit" name="confirmUnusual" value="yes">
                    Confirm these values and submit {material.code}
                  </Button>
                ) : (
                  <Button type="submit">Submit {material.code}</Button>
                )}
              </div>
            </Form>
          </Card>
        )}
        <AmendmentHistory responses={responses} />
      </div>
    </>
  );
}

function CellInput({
  id,
  label,
  error,
  warning,
  onChange,
  wide = false,
  ...input
}: {
  id: string;
  /** A name rather than a figure: room for one on a wide screen. */
  wide?: boolean;
  /** Shown in a replicate's card on a phone; where the table's headers name the column, for assistive technology only. */
  label: string;
  error?: string;
  warning?: string;
  onChange: (value: string) => void;
} & Omit<React.ComponentProps<"input">, "onChange" | "id">) {
  const describedBy = error ? `${id}-error` : warning ? `${id}-warning` : undefined;
  return (
    <div className={`flex flex-col gap-1 ${wide ? "sm:min-w-36" : "sm:min-w-20"}`}>
      <label htmlFor={id} className="text-sm font-semibold sm:sr-only">
        {label}
      </label>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`min-h-11 w-full rounded-md border bg-white px-2 py-1 ${error ? "border-signal-700" : "border-basalt-200"}`}
        onChange={(e) => onChange(e.target.value)}
        {...input}
      />
      {error && (
        <p id={`${id}-error`} className="text-sm font-semibold text-signal-700">
          {error}
        </p>
      )}
      {!error && warning && (
        <p id={`${id}-warning`} className="text-sm text-ochre-800">
          {warning}
        </p>
      )}
    </div>
  );
}

type ResponseView = Route.ComponentProps["loaderData"]["responses"][number];

function SubmittedResults({
  responses,
  replicates,
  values,
  actionData,
  editable,
  correctable,
  photos,
  photoLabel,
}: {
  responses: ResponseView[];
  replicates: number[];
  values: Record<string, number>;
  actionData: ActionData;
  editable: boolean;
  correctable: number[];
  photos: Record<number, number>;
  photoLabel: string;
}) {
  const answered = actionData && "result" in actionData ? actionData.result?.initialValue : undefined;
  return (
    <div className="grid gap-4">
      {responses.map((response) => (
        <section key={response.id} aria-labelledby={`response-${response.id}`}>
          <h3 id={`response-${response.id}`} className="mb-2 font-semibold">
            {response.name} {response.cell && <CellStatusBadge status={response.cell.amended ? "amended" : "submitted"} />}
          </h3>
          <ul className="grid gap-2">
            {replicates.map((replicate) => {
              const mine = answered?.intent === "amend" && answered.responseId === String(response.id) && answered.replicate === String(replicate);
              return (
                <li key={replicate} className="flex flex-wrap items-start gap-3">
                  <span className="min-w-40">
                    Replicate {replicate}: <span className="font-semibold">{values[`${response.key}:${replicate}`] ?? "—"}</span> {response.unit}
                  </span>
                  {photos[replicate] && <PhotoThumbnail photoId={photos[replicate]} replicate={replicate} label={photoLabel} />}
                  {(editable || correctable.includes(response.id)) && (
                    <Suspense>
                      <AmendForm response={response} replicate={replicate} reply={mine ? actionData : undefined} />
                    </Suspense>
                  )}
                </li>
              );
            })}
          </ul>
        </section>
      ))}
    </div>
  );
}

function AmendmentHistory({ responses }: { responses: ResponseView[] }) {
  const rows = responses.flatMap((r) => r.amendments.map((a) => ({ ...a, responseName: r.name })));
  if (rows.length === 0) return null;
  return (
    <Card title="Amendments">
      <ul className="grid gap-2" aria-label="Amendments of this material">
        {rows.map((a) => (
          <li key={a.id}>
            {a.responseName}, replicate {a.replicate}: {a.oldValue ?? "—"} → <span className="font-semibold">{a.newValue}</span> · “{a.reason}” · {a.byName},{" "}
            {formatDateTime(a.createdAt)}
          </li>
        ))}
      </ul>
    </Card>
  );
}
