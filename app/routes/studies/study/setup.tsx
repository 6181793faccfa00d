import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/setup";
import { DataTable } from "~/components/data-table";
import { StudyFields } from "~/components/study-fields";
import { Badge, Button, Card, Field, Notice, PageHeader, SelectField } from "~/components/ui";
import type { StudyState } from "~/db/schema";
import { mmToIn } from "~/lib/batching";
import { type ActionResult, FieldRefusal, formState, handleForm, refused } from "~/lib/form-results";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { freshTargetsSchema, materialSchema, personSchema, responseSchema, studyFields, transitionSchema } from "~/lib/study-forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { allowedNextStates, MOVE_CONSEQUENCES } from "~/lib/study-lifecycle";
import { ConfirmStep } from "~/components/confirm-dialog";
import { mayWrite, writeRefusal } from "~/lib/write-rules";
import { STATE_LABEL } from "~/lib/state-labels";
import { readUploadForm } from "~/server/upload-form.server";
import { PDF_TYPES, storeUpload, UploadError } from "~/server/uploads.server";
import { idField } from "~/lib/validation";
import { previewTransition, transitionStudy } from "~/models/study-lifecycle.server";
import {
  addMaterial,
  addPerson,
  addResponse,
  loadSetup,
  removeMaterial,
  removePerson,
  removeResponse,
  setFreshTargets,
  setProtocol,
  updateStudy,
} from "~/models/study-setup.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Setup ${data?.study.code ?? ""} · Ringbatch` }];

const PROTOCOL_MAX_BYTES = 10 * 1024 * 1024;

export async function loader({ context }: Route.LoaderArgs) {
  const { study, user, access } = requireStudy(context, ["coordinator", "admin", "reviewer"]);
  const setup = await loadSetup(study);
  const moves = await Promise.all(
    allowedNextStates(study.state, "setup").map(async (to) => ({ to, ...(await previewTransition(study, to)) })),
  );
  return { study, setup, moves: access === "coordinator" ? moves : [], canEdit: access === "coordinator", isOwner: study.ownerId === user.id };
}

const idForm = z.object({ id: idField });

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  if (request.headers.get("Content-Type")?.startsWith("multipart/form-data")) {
    // Refused before the file is stored, so a late upload leaves nothing behind.
    const closed = writeRefusal("protocol", study.state);
    if (closed) return refused("protocol", { protocol: closed });
    const upload = await readUploadForm(request, "protocol", PROTOCOL_MAX_BYTES);
    if (upload.tooLarge) return refused("protocol", { protocol: "The file is larger than 10 MB." });
    if (!upload.file) return refused("protocol", { protocol: "Choose a PDF file to upload." });
    try {
      const attachment = await storeUpload(upload.file, { allowed: PDF_TYPES, maxBytes: PROTOCOL_MAX_BYTES, uploadedBy: user.id });
      await setProtocol(study, attachment.id, user.id);
      return { intent: "protocol", done: `Protocol ${attachment.originalName} attached.` } satisfies ActionResult;
    } catch (error) {
      if (error instanceof UploadError) return refused("protocol", { protocol: error.message });
      throw error;
    }
  }
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  const ownerOnly = () => {
    if (study.ownerId !== user.id) notFound();
  };
  switch (intent) {
    case "study":
      return handleForm(intent, studyFields, form, async (input) => {
        await updateStudy(study, input, user.id);
        return { done: "Study details saved." };
      });
    case "response-add":
      return handleForm(intent, responseSchema, form, async (input) => {
        await addResponse(study, input, user.id);
        return { done: `Response ${input.name} added.` };
      });
    case "response-remove":
      return handleForm(intent, idForm, form, async ({ id }) => {
        await removeResponse(study, id, user.id);
        return { done: "Response removed." };
      });
    case "targets":
      return handleForm(intent, freshTargetsSchema, form, async (input) => {
        await setFreshTargets(study, input, user.id);
        return { done: "Fresh-property targets saved." };
      });
    case "coordinator-add":
    case "reviewer-add":
      ownerOnly();
      return handleForm(intent, personSchema, form, async ({ email }) => {
        await addPerson(study, intent === "coordinator-add" ? "coordinator" : "reviewer", email, user.id);
        return { done: `${email} added.` };
      });
    case "coordinator-remove":
    case "reviewer-remove":
      ownerOnly();
      return handleForm(intent, idForm, form, async ({ id }) => {
        await removePerson(study, intent === "coordinator-remove" ? "coordinator" : "reviewer", id, user.id);
        return { done: "Removed." };
      });
    case "material-add":
      return handleForm(intent, materialSchema, form, async (input) => {
        const material = await addMaterial(study, input, user.id);
        return redirect(`/studies/${study.id}/materials/${material.id}`);
      });
    case "material-remove":
      return handleForm(intent, idForm, form, async ({ id }) => {
        await removeMaterial(study, id, user.id);
        return { done: "Material removed." };
      });
    case "transition":
      return handleForm(intent, transitionSchema, form, async ({ to }) => {
        const check = await transitionStudy(study, to, user.id);
        if (!check.allowed) throw new FieldRefusal("to", check.problems.join(" "));
        return { done: `The study is now: ${STATE_LABEL[to]}.`, warnings: check.warnings };
      });
    default:
      return refused(intent, { form: "Unknown action." });
  }
}

function resultOf(actionData: unknown, intent: string) {
  return formState(actionData as ActionResult | undefined, intent);
}

const MOVE_LABEL: Partial<Record<StudyState, string>> = {
  draft: "Back to draft",
  recruiting: "Open recruiting",
  testing: "Start testing",
  checking: "Close testing and check data",
  cancelled: "Cancel the study",
};

export default function StudySetup({ loaderData, actionData }: Route.ComponentProps) {
  const { study, setup, moves, canEdit, isOwner } = loaderData;
  const busy = useNavigation().state === "submitting";
  const editable = canEdit && mayWrite("design", study.state);
  const transition = resultOf(actionData, "transition");
  const details = resultOf(actionData, "study");
  const responseAdd = resultOf(actionData, "response-add");
  // The same schemas as the action, checked in the browser before posting.
  const detailsCheck = useSchemaCheck(studyFields, details.errors);
  const responseCheck = useSchemaCheck(responseSchema, responseAdd.errors);
  const targets = resultOf(actionData, "targets");
  const protocol = resultOf(actionData, "protocol");
  const materialAdd = resultOf(actionData, "material-add");
  const slump = setup.targets.find((t) => t.property === "slump");
  const air = setup.targets.find((t) => t.property === "air_content");
  const done = (actionData as ActionResult | undefined)?.done;
  const errorsOf = (intent: string) => resultOf(actionData, intent).errors;
  const studyValues = Object.keys(details.values).length
    ? details.values
    : {
        ...Object.fromEntries(Object.entries(study).map(([k, v]) => [k, v == null ? "" : String(v)])),
      };
  return (
    <>
      <PageHeader title={`${study.code} — setup`} subtitle={<>{study.title} · <Badge>{STATE_LABEL[study.state]}</Badge></>} />
      <div className="flex flex-col gap-6">
        {done && <Notice tone="success">{done}</Notice>}
        {transition.warnings?.map((w) => (
          <Notice key={w} tone="caution">
            {w}
          </Notice>
        ))}

        {moves.length > 0 && (
          <Card title="Study state">
            <p className="mb-3">
              Now: <Badge>{STATE_LABEL[study.state]}</Badge>. Results can be entered only while the study is testing; replicates, responses, materials
              and the protocol are fixed once testing starts. Sending to the committee and publishing happen on the statement page.
            </p>
            {transition.errors.to && <Notice tone="error">{transition.errors.to}</Notice>}
            <div className="mt-3 flex flex-wrap gap-4">
              {moves.map((move) => (
                <Form key={move.to} method="post" className="flex max-w-sm flex-col gap-1">
                  <input type="hidden" name="intent" value="transition" />
                  <input type="hidden" name="to" value={move.to} />
                  <ConfirmStep
                    label={MOVE_LABEL[move.to] ?? STATE_LABEL[move.to]}
                    title={`${MOVE_LABEL[move.to] ?? STATE_LABEL[move.to]}?`}
                    consequences={
                      <>
                        <p>{MOVE_CONSEQUENCES[move.to]}</p>
                        {move.warnings.map((w) => (
                          <p key={w}>{w}</p>
                        ))}
                        <p>This cannot be undone from this page.</p>
                      </>
                    }
                    confirmLabel={MOVE_LABEL[move.to] ?? STATE_LABEL[move.to]}
                    variant={move.to === "cancelled" ? "danger" : "primary"}
                    disabled={busy || !move.allowed}
                  />
                  {[...move.problems, ...move.warnings].map((p) => (
                    <p key={p} className="text-sm text-basalt-700">
                      {p}
                    </p>
                  ))}
                </Form>
              ))}
            </div>
          </Card>
        )}

        <Card title="Study details">
          {canEdit && writeRefusal("details", study.state) && <p className="mb-3 text-basalt-700">{writeRefusal("details", study.state)}</p>}
          {canEdit && mayWrite("details", study.state) ? (
            <Form method="post" className="flex flex-col gap-4" onSubmit={detailsCheck.onSubmit} noValidate>
              <input type="hidden" name="intent" value="study" />
              <StudyFields
                values={studyValues}
                errors={detailsCheck.errors}
                fixed={{ replicatesPerCell: writeRefusal("design", study.state) ?? undefined, significanceLevel: writeRefusal("analysisSettings", study.state) ?? undefined }}
              />
              <div>
                <Button type="submit" disabled={busy}>
                  Save details
                </Button>
              </div>
            </Form>
          ) : (
            <dl className="grid gap-2 md:grid-cols-2">
              <div><dt className="font-semibold">Test method</dt><dd>{study.testMethod}</dd></div>
              <div><dt className="font-semibold">Replicates per cell</dt><dd>{study.replicatesPerCell}</dd></div>
              <div><dt className="font-semibold">Results due</dt><dd>{study.resultsDue ?? "—"}</dd></div>
              <div><dt className="font-semibold">Notes</dt><dd>{study.notes || "—"}</dd></div>
            </dl>
          )}
        </Card>

        <Card title="Responses">
          <DataTable
            caption="Responses of the test method"
            filterLabel="Filter responses"
            empty="No responses yet."
            data={setup.responses}
            columns={[
              { id: "key", header: "Key", value: (r) => r.key },
              { id: "name", header: "Name", value: (r) => r.name },
              { id: "unit", header: "Unit", value: (r) => r.unit || null },
              { id: "kind", header: "Kind", value: (r) => r.kind },
              { id: "decimals", header: "Decimals", value: (r) => r.decimals },
              {
                id: "range",
                header: "Plausible range",
                value: (r) => (r.plausibleMin ?? r.plausibleMax) == null ? null : `${r.plausibleMin ?? "…"} to ${r.plausibleMax ?? "…"}`,
              },
              ...(editable
                ? [removeColumn<(typeof setup.responses)[number]>("response-remove", (r) => `Remove response ${r.name}`, busy)]
                : []),
            ]}
          />
          {errorsOf("response-remove").form && <Notice tone="error">{errorsOf("response-remove").form}</Notice>}
          {canEdit && !editable && <p className="mt-3 text-basalt-700">{writeRefusal("design", study.state)}</p>}
          {editable && (
            <Form method="post" className="mt-4 grid gap-4 border-t border-basalt-100 pt-4 md:grid-cols-3" onSubmit={responseCheck.onSubmit} noValidate>
              <input type="hidden" name="intent" value="response-add" />
              <Field label="Key" name="key" defaultValue={responseAdd.values.key} error={responseCheck.errors.key} hint="e.g. holes" />
              <Field label="Response name" name="name" defaultValue={responseAdd.values.name} error={responseCheck.errors.name} />
              <Field label="Unit" name="unit" defaultValue={responseAdd.values.unit} error={responseCheck.errors.unit} />
              <SelectField
                label="Kind"
                name="kind"
                defaultValue={responseAdd.values.kind ?? "count"}
                error={responseCheck.errors.kind}
                options={[
                  { value: "count", label: "Count" },
                  { value: "continuous", label: "Continuous" },
                ]}
              />
              <Field label="Decimals" name="decimals" inputMode="numeric" defaultValue={responseAdd.values.decimals ?? "0"} error={responseCheck.errors.decimals} />
              <Field label="Lowest plausible value" name="plausibleMin" inputMode="decimal" defaultValue={responseAdd.values.plausibleMin} error={responseCheck.errors.plausibleMin} />
              <Field label="Highest plausible value" name="plausibleMax" inputMode="decimal" defaultValue={responseAdd.values.plausibleMax} error={responseCheck.errors.plausibleMax} />
              <div className="self-end">
                <Button type="submit" disabled={busy}>
                  Add response
                </Button>
              </div>
            </Form>
          )}
        </Card>

        <Card title="Fresh-property targets">
          <p className="mb-3">
            Slump: {slump ? `${slump.target} ± ${slump.tolerance} mm (${round(mmToIn(slump.target), 2)} ± ${round(mmToIn(slump.tolerance), 2)} in)` : "no target"}. Air
            content: {air ? `${air.target} ± ${air.tolerance} %` : "no target"}.
          </p>
          {canEdit && !editable && <p className="mt-3 text-basalt-700">{writeRefusal("design", study.state)}</p>}
          {editable && (
            <Form method="post" className="grid gap-4 md:grid-cols-3">
              <input type="hidden" name="intent" value="targets" />
              <Field label="Slump target" name="slumpTarget" inputMode="decimal" defaultValue={targets.values.slumpTarget ?? (slump ? String(slump.target) : "")} error={targets.errors.slumpTarget} />
              <SelectField
                label="Slump unit"
                name="slumpUnit"
                defaultValue={targets.values.slumpUnit ?? "mm"}
                error={targets.errors.slumpUnit}
                options={[
                  { value: "mm", label: "mm" },
                  { value: "in", label: "in" },
                ]}
              />
              <Field
                label="Slump tolerance ±"
                name="slumpTolerance"
                inputMode="decimal"
                defaultValue={targets.values.slumpTolerance ?? (slump ? String(slump.tolerance) : "")}
                error={targets.errors.slumpTolerance}
                hint="Blank: the usual tolerance for the target (ASTM C94)"
              />
              <Field label="Air content target, %" name="airTarget" inputMode="decimal" defaultValue={targets.values.airTarget ?? (air ? String(air.target) : "")} error={targets.errors.airTarget} />
              <Field
                label="Air content tolerance ±, percentage points"
                name="airTolerance"
                inputMode="decimal"
                defaultValue={targets.values.airTolerance ?? (air ? String(air.tolerance) : "")}
                error={targets.errors.airTolerance}
                hint="Blank: ± 1.5 points (ASTM C94)"
              />
              <div className="self-end">
                <Button type="submit" disabled={busy}>
                  Save targets
                </Button>
              </div>
            </Form>
          )}
        </Card>

        <Card title="Protocol">
          <p className="mb-3">
            {setup.protocol ? (
              <a href={`/files/${setup.protocol.id}`} className="font-semibold text-basalt-700 underline">
                {setup.protocol.originalName}
              </a>
            ) : (
              "No protocol attached yet."
            )}
          </p>
          {protocol.done && <Notice tone="success">{protocol.done}</Notice>}
          {canEdit && writeRefusal("protocol", study.state) && <p className="text-basalt-700">{writeRefusal("protocol", study.state)}</p>}
          {canEdit && mayWrite("protocol", study.state) && (
            <Form method="post" encType="multipart/form-data" className="flex flex-wrap items-end gap-4">
              <Field label="Protocol (PDF, up to 10 MB)" name="protocol" type="file" accept="application/pdf" error={protocol.errors.protocol} />
              <Button type="submit" disabled={busy}>
                Upload protocol
              </Button>
            </Form>
          )}
        </Card>

        <div className="grid gap-6 md:grid-cols-2">
          <PeopleCard
            title="Coordinators"
            kind="coordinator"
            people={[{ ...setup.owner, owner: true }, ...setup.coordinators.map((p) => ({ ...p, owner: false }))]}
            canChange={isOwner && mayWrite("coordinators", study.state)}
            fixedBecause={isOwner ? writeRefusal("coordinators", study.state) : null}
            result={resultOf(actionData, "coordinator-add")}
            busy={busy}
          />
          <PeopleCard
            title="Committee reviewers"
            kind="reviewer"
            people={setup.reviewers.map((p) => ({ ...p, owner: false }))}
            canChange={isOwner && mayWrite("reviewers", study.state)}
            fixedBecause={isOwner ? writeRefusal("reviewers", study.state) : null}
            result={resultOf(actionData, "reviewer-add")}
            busy={busy}
          />
        </div>

        <Card title="Materials">
          <DataTable
            caption="Materials of the study"
            filterLabel="Filter materials"
            empty="No materials yet."
            data={setup.materials}
            columns={[
              {
                id: "code",
                header: "Code",
                value: (m) => m.code,
                cell: (m) => (
                  <Link to={`/studies/${study.id}/materials/${m.id}`} className="font-semibold text-basalt-700 underline">
                    {m.code}
                  </Link>
                ),
              },
              { id: "description", header: "Description", value: (m) => m.description || null },
              { id: "constituents", header: "Mixture design rows", value: (m) => m.constituents },
              ...(editable
                ? [removeColumn<(typeof setup.materials)[number]>("material-remove", (m) => `Remove material ${m.code}`, busy)]
                : []),
            ]}
          />
          {canEdit && !editable && <p className="mt-3 text-basalt-700">{writeRefusal("design", study.state)}</p>}
          {editable && (
            <Form method="post" className="mt-4 grid gap-4 border-t border-basalt-100 pt-4 md:grid-cols-3">
              <input type="hidden" name="intent" value="material-add" />
              <Field label="Material code" id="field-material-code" name="code" defaultValue={materialAdd.values.code} error={materialAdd.errors.code} hint="e.g. M1" />
              <Field label="Description" id="field-material-description" name="description" defaultValue={materialAdd.values.description} error={materialAdd.errors.description} />
              <div className="self-end">
                <Button type="submit" disabled={busy}>
                  Add material
                </Button>
              </div>
            </Form>
          )}
        </Card>
        <p className="text-sm text-basalt-700">
          This tool supports the committee's judgement and does not replace it; local codes, specifications and licensed engineers govern the
          concrete.
        </p>
      </div>
    </>
  );
}

function round(value: number, digits: number) {
  return Number(value.toFixed(digits));
}

function PeopleCard({
  title,
  kind,
  people,
  canChange,
  fixedBecause,
  result,
  busy,
}: {
  title: string;
  kind: "coordinator" | "reviewer";
  people: { id: number; name: string; email: string; owner: boolean }[];
  canChange: boolean;
  /** Why the list cannot change in the study's state (~/lib/write-rules), shown instead of the controls. */
  fixedBecause: string | null;
  result: ReturnType<typeof formState>;
  busy: boolean;
}) {
  return (
    <Card title={title}>
      {result.done && <Notice tone="success">{result.done}</Notice>}
      {fixedBecause && <p className="mb-3 text-basalt-700">{fixedBecause}</p>}
      <ul className="mb-3 flex flex-col gap-2">
        {people.length === 0 && <li>Nobody yet.</li>}
        {people.map((p) => (
          <li key={p.id} className="flex flex-wrap items-center justify-between gap-2">
            <span>
              {p.name} <span className="text-sm text-basalt-700">{p.email}</span> {p.owner && <Badge>Owner</Badge>}
            </span>
            {canChange && !p.owner && (
              <Form method="post">
                <input type="hidden" name="intent" value={`${kind}-remove`} />
                <input type="hidden" name="id" value={p.id} />
                <Button type="submit" variant="secondary" aria-label={`Remove ${p.name}`} disabled={busy}>
                  Remove
                </Button>
              </Form>
            )}
          </li>
        ))}
      </ul>
      {canChange && (
        <Form method="post" className="flex flex-wrap items-end gap-3">
          <input type="hidden" name="intent" value={`${kind}-add`} />
          <Field label={`Add ${kind === "coordinator" ? "co-coordinator" : "reviewer"} by e-mail`} name="email" id={`field-${kind}-email`} type="email" defaultValue={result.values.email} error={result.errors.email} />
          <Button type="submit" disabled={busy}>
            Add
          </Button>
        </Form>
      )}
    </Card>
  );
}

/** A table column with one "Remove" button per row, posting `intent` and the row's id. */
function removeColumn<Row extends { id: number }>(intent: string, label: (row: Row) => string, busy: boolean) {
  return {
    id: "remove",
    header: "Remove",
    sortable: false,
    value: () => null,
    cell: (row: Row) => (
      <Form method="post">
        <input type="hidden" name="intent" value={intent} />
        <input type="hidden" name="id" value={row.id} />
        <Button type="submit" variant="secondary" aria-label={label(row)} disabled={busy}>
          Remove
        </Button>
      </Form>
    ),
  };
}
