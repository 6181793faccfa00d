import { parseWithZod } from "@conform-to/zod/v4";
import type { ReactNode } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/setup";
import { DetailList } from "~/components/detail-list";
import { ConfirmStep } from "~/components/confirm-dialog";
import { type DataColumn, DataTable } from "~/components/data-table";
import { fieldProps, FormErrors, PostForm, refusalOf, useSchemaForm } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { StudyFields } from "~/components/study-fields";
import { StudyPlanner } from "~/components/study-planner";
import { Badge, Button, Card, Field, Notice, SelectField } from "~/components/ui";
import type { StudyState } from "~/db/schema";
import { mmToIn } from "~/lib/batching";
import { FieldRefusal } from "~/lib/field-refusal";
import { formatDate } from "~/lib/format";
import { STATE_LABEL, STUDY_STATE } from "~/lib/state-labels";
import { PROTOCOL_MAX_BYTES, protocolSchema, setupForms, setupSchemas, studyDetailsForms } from "~/lib/study-forms";
import { allowedNextStates, MOVE_CONSEQUENCES } from "~/lib/study-lifecycle";
import { mayWrite, writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";
import { previewTransition, transitionStudy } from "~/models/study-lifecycle.server";
import { plannerView } from "~/models/study-planner.server";
import {
  addMaterial,
  addPerson,
  addResponse,
  loadSetup,
  reviewerCandidates,
  removeMaterial,
  removePerson,
  removeResponse,
  setFreshTargets,
  setProtocol,
  updateStudy,
} from "~/models/study-setup.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { readUploadForm } from "~/server/upload-form.server";
import { PDF_TYPES, storeUpload, UploadError } from "~/server/uploads.server";

export const handle = { pageTitle: "Setup" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** Only the study's owner changes who coordinates and reviews it. */
const OWNER_ONLY = new Set(["coordinator-add", "reviewer-add", "coordinator-remove", "reviewer-remove"]);

export async function loader({ request, context }: Route.LoaderArgs) {
  const { study, user, access } = requireStudy(context, ["coordinator", "admin", "reviewer"]);
  const planner = access === "reviewer" ? null : await plannerView(user, new URL(request.url).searchParams, study);
  const [setup, reviewerChoice] = await Promise.all([loadSetup(study), study.ownerId === user.id ? reviewerCandidates(study) : null]);
  const moves = await Promise.all(
    allowedNextStates(study.state, "setup").map(async (to) => ({ to, ...(await previewTransition(study, to)) })),
  );
  return { study, setup, moves: access === "coordinator" ? moves : [], canEdit: access === "coordinator", isOwner: study.ownerId === user.id, planner, reviewerChoice };
}

/** A refused protocol upload, in the same shape as a refused form, beside the file field. */
function refuseProtocol(message: string) {
  return data({ result: { status: "error" as const, initialValue: { intent: "protocol" }, error: { protocol: [message] } } }, { status: 400 });
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const setupPage = `/studies/${study.id}/setup`;
  if (request.headers.get("Content-Type")?.startsWith("multipart/form-data")) {
    // Refused before the file is stored, so a late upload leaves nothing behind.
    const closed = writeRefusal("protocol", study.state);
    if (closed) return refuseProtocol(closed);
    const upload = await readUploadForm(request, "protocol", PROTOCOL_MAX_BYTES);
    if (upload.tooLarge) return refuseProtocol("The file is larger than 10 MB.");
    if (!upload.file) return refuseProtocol("Choose a PDF file to upload.");
    try {
      const attachment = await storeUpload(upload.file, { allowed: PDF_TYPES, maxBytes: PROTOCOL_MAX_BYTES, uploadedBy: user.id });
      await setProtocol(study, attachment.id, user.id);
      return redirectWithToast(setupPage, `Protocol ${attachment.originalName} attached.`);
    } catch (error) {
      if (error instanceof UploadError) return refuseProtocol(error.message);
      throw error;
    }
  }
  const submission = parseWithZod(await request.formData(), { schema: setupSchemas[study.kind] });
  if (submission.status !== "success") return refuse(submission);
  const form = submission.value;
  if (OWNER_ONLY.has(form.intent) && study.ownerId !== user.id) notFound();
  const transitionFromSetup = async (to: StudyState) => {
    const check = await transitionStudy(study, to, user.id);
    if (!check.allowed) throw new TransitionRefusal(check.problems.join(" "));
    const message = [`The study is now: ${STATE_LABEL[to]}.`, ...check.warnings].join(" ");
    return { message, tone: check.warnings.length > 0 ? ("info" as const) : ("success" as const) };
  };
  // Each change either confirms with a message or is refused beside its field.
  const change = async (): Promise<{ message: string; to?: string; tone?: "success" | "info" }> => {
    switch (form.intent) {
      case "study": {
        const { intent: _, ...input } = form;
        await updateStudy(study, input, user.id);
        return { message: "Study details saved." };
      }
      case "response-add": {
        const { intent: _, ...input } = form;
        await addResponse(study, input, user.id);
        return { message: `Response ${input.name} added.` };
      }
      case "response-remove":
        await removeResponse(study, form.id, user.id);
        return { message: "Response removed." };
      case "targets": {
        const { intent: _, ...input } = form;
        await setFreshTargets(study, input, user.id);
        return { message: "Fresh-property targets saved." };
      }
      case "coordinator-add":
      case "reviewer-add":
        await addPerson(study, form.intent === "coordinator-add" ? "coordinator" : "reviewer", form.email, user.id);
        return { message: `${form.email} added.` };
      case "coordinator-remove":
      case "reviewer-remove":
        await removePerson(study, form.intent === "coordinator-remove" ? "coordinator" : "reviewer", form.id, user.id);
        return { message: "Removed." };
      case "material-add": {
        const { intent: _, ...input } = form;
        const material = await addMaterial(study, input, user.id);
        return { message: `Material ${material.code} added: enter its mixture design.`, to: `/studies/${study.id}/materials/${material.id}` };
      }
      case "material-remove":
        await removeMaterial(study, form.id, user.id);
        return { message: "Material removed." };
      case "transition":
        return transitionFromSetup(form.to);
    }
  };
  const outcome = await withRefusals(submission, change);
  if (!outcome.ok) return outcome.reply;
  return redirectWithToast(outcome.value.to ?? setupPage, outcome.value.message, outcome.value.tone);
}

/** A move the study's state does not allow, shown beside the state buttons. */
class TransitionRefusal extends FieldRefusal {
  constructor(message: string) {
    super("to", message);
  }
}

const MOVE_LABEL: Partial<Record<StudyState, string>> = {
  draft: "Back to draft",
  recruiting: "Open recruiting",
  testing: "Start testing",
  checking: "Close testing and check data",
  cancelled: "Cancel the study",
};

export default function StudySetup({ loaderData, actionData }: Route.ComponentProps) {
  const { study, setup, moves, canEdit, isOwner, reviewerChoice } = loaderData;
  const busy = useNavigation().state === "submitting";
  const editable = canEdit && mayWrite("design", study.state);
  const designFixed = canEdit && !editable ? writeRefusal("design", study.state) : null;
  const slump = setup.targets.find((t) => t.property === "slump");
  const air = setup.targets.find((t) => t.property === "air_content");
  const transitionRefusal = refusalOf(actionData, "transition");
  const designEditing = { editable, designFixed, reply: actionData, busy };
  return (
    <div className="flex flex-col gap-6">
      <p className="text-basalt-700">
        The study's details, responses, fresh-property targets, protocol, people and materials. Replicates, responses, materials and the protocol are fixed
        once testing starts.
      </p>
      {moves.length > 0 && (
        <Card title="Study state">
          <p className="mb-3">
            Now: <StateBadge view={STUDY_STATE[study.state]} />. Results can be entered only while the study is testing; replicates, responses, materials and
            the protocol are fixed once testing starts. Sending to the committee and publishing happen on the statement page.
          </p>
          {transitionRefusal.length > 0 && <Notice tone="error">{transitionRefusal.join(" ")}</Notice>}
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
          <DetailsForm study={study} reply={actionData} />
        ) : (
          <DetailList
            items={[
              ["Test method", study.testMethod],
              ["Replicates per cell", study.replicatesPerCell],
              ["Results due", formatDate(study.resultsDue)],
              ["Notes", study.notes || "—"],
            ]}
          />
        )}
      </Card>

      <DesignListCard
        title="Responses"
        caption="Responses of the test method"
        rows={setup.responses}
        columns={RESPONSE_COLUMNS}
        remove={{ intent: "response-remove", label: (r) => `Remove response ${r.name}` }}
        {...designEditing}
      >
        <ResponseForm reply={actionData} />
      </DesignListCard>

      <Card title="Fresh-property targets">
        <p className="mb-3">
          Slump: {slump ? `${slump.target} ± ${slump.tolerance} mm (${round(mmToIn(slump.target), 2)} ± ${round(mmToIn(slump.tolerance), 2)} in)` : "no target"}. Air
          content: {air ? `${air.target} ± ${air.tolerance} %` : "no target"}.
        </p>
        {designFixed && <p className="mt-3 text-basalt-700">{designFixed}</p>}
        {editable && <TargetsForm reply={actionData} slump={slump} air={air} />}
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
        {canEdit && writeRefusal("protocol", study.state) && <p className="text-basalt-700">{writeRefusal("protocol", study.state)}</p>}
        {canEdit && mayWrite("protocol", study.state) && <ProtocolForm reply={actionData} />}
      </Card>

      <div className="grid gap-6 md:grid-cols-2">
        <PeopleCard
          title="Coordinators"
          kind="coordinator"
          people={[{ ...setup.owner, owner: true }, ...setup.coordinators.map((p) => ({ ...p, owner: false }))]}
          canChange={isOwner && mayWrite("coordinators", study.state)}
          fixedBecause={isOwner ? writeRefusal("coordinators", study.state) : null}
          reply={actionData}
          busy={busy}
        />
        <PeopleCard
          title="Committee reviewers"
          kind="reviewer"
          people={setup.reviewers.map((p) => ({ ...p, owner: false }))}
          candidates={reviewerChoice}
          canChange={isOwner && mayWrite("reviewers", study.state)}
          fixedBecause={isOwner ? writeRefusal("reviewers", study.state) : null}
          reply={actionData}
          busy={busy}
        />
      </div>

      <DesignListCard
        title="Materials"
        caption="Materials of the study"
        rows={setup.materials}
        columns={materialColumns(study.id)}
        remove={{ intent: "material-remove", label: (m) => `Remove material ${m.code}` }}
        {...designEditing}
      >
        <MaterialForm reply={actionData} />
      </DesignListCard>
      {loaderData.planner && (
        <Card>
          <StudyPlanner view={loaderData.planner} />
        </Card>
      )}
      <p className="text-sm text-basalt-700">
        This tool supports the committee's judgement and does not replace it; local codes, specifications and licensed engineers govern the concrete.
      </p>
    </div>
  );
}

type FormArgs = { reply: unknown };
type SetupStudy = Route.ComponentProps["loaderData"]["study"];
type SetupLists = Route.ComponentProps["loaderData"]["setup"];

const RESPONSE_COLUMNS: DataColumn<SetupLists["responses"][number]>[] = [
  { id: "key", header: "Key", value: (r) => r.key },
  { id: "name", header: "Name", value: (r) => r.name },
  { id: "unit", header: "Unit", value: (r) => r.unit || null },
  { id: "kind", header: "Kind", value: (r) => r.kind },
  { id: "decimals", header: "Decimals", value: (r) => r.decimals },
  {
    id: "range",
    header: "Plausible range",
    value: (r) => ((r.plausibleMin ?? r.plausibleMax) == null ? null : `${r.plausibleMin ?? "…"} to ${r.plausibleMax ?? "…"}`),
  },
];

function materialColumns(studyId: number): DataColumn<SetupLists["materials"][number]>[] {
  return [
    {
      id: "code",
      header: "Code",
      value: (m) => m.code,
      cell: (m) => (
        <Link to={`/studies/${studyId}/materials/${m.id}`} className="font-semibold text-basalt-700 underline">
          {m.code}
        </Link>
      ),
    },
    { id: "description", header: "Description", value: (m) => m.description || null },
    { id: "constituents", header: "Mixture design rows", value: (m) => m.constituents },
  ];
}

/**
 * A list of the study's design (its responses, its materials): the table and,
 * while the design may change, a "Remove" button per row and the form that
 * adds one (`children`); otherwise the reason it is fixed.
 */
function DesignListCard<Row extends { id: number }>({
  title,
  caption,
  rows,
  columns,
  remove,
  editable,
  designFixed,
  reply,
  busy,
  children,
}: FormArgs & {
  title: string;
  caption: string;
  rows: Row[];
  columns: DataColumn<Row>[];
  remove: { intent: string; label: (row: Row) => string };
  editable: boolean;
  designFixed: string | null;
  busy: boolean;
  children: ReactNode;
}) {
  const listName = title.toLowerCase();
  return (
    <Card title={title}>
      <DataTable
        caption={caption}
        filterLabel={`Filter ${listName}`}
        empty={`No ${listName} yet.`}
        data={rows}
        columns={editable ? [...columns, removeColumn(remove.intent, remove.label, busy)] : columns}
      />
      <FormErrors errors={refusalOf(reply, remove.intent)} />
      {designFixed && <p className="mt-3 text-basalt-700">{designFixed}</p>}
      {editable && children}
    </Card>
  );
}

/** The study as the details form shows it: stored values as typed text. */
function detailsDefaults(study: SetupStudy) {
  return {
    code: study.code,
    title: study.title,
    testMethod: study.testMethod,
    replicatesPerCell: String(study.replicatesPerCell),
    significanceLevel: String(study.significanceLevel),
    targetSurfaceRating: study.targetSurfaceRating === null ? "" : String(study.targetSurfaceRating),
    specimenVolumeM3: study.specimenVolumeM3 === null ? "" : String(study.specimenVolumeM3),
    wastePercent: study.wastePercent === null ? "" : String(study.wastePercent),
    enrollmentDeadline: study.enrollmentDeadline ?? "",
    shipDate: study.shipDate ?? "",
    resultsDue: study.resultsDue ?? "",
    notes: study.notes,
  };
}

function DetailsForm({ study, reply }: FormArgs & { study: SetupStudy }) {
  const [form, fields] = useSchemaForm(studyDetailsForms[study.kind], { reply, intent: "study", defaultValue: detailsDefaults(study) });
  return (
    <PostForm form={form} submitLabel="Save details" hidden={{ intent: "study" }}>
      <StudyFields
        fields={fields}
        fixed={{ replicatesPerCell: writeRefusal("design", study.state) ?? undefined, significanceLevel: writeRefusal("analysisSettings", study.state) ?? undefined }}
      />
    </PostForm>
  );
}

/** The look of a form that adds a row below its card's table. */
const ADD_ROW_FORM = { className: "mt-4 grid gap-4 border-t border-basalt-100 pt-4 md:grid-cols-3", errorsClassName: "md:col-span-3", submitClassName: "self-end" };

const RESPONSE_KINDS = [
  { value: "count", label: "Count" },
  { value: "continuous", label: "Continuous" },
];

function ResponseForm({ reply }: FormArgs) {
  const [form, fields] = useSchemaForm(setupForms.responseAdd, { reply, intent: "response-add", defaultValue: { kind: "count", decimals: "0" } });
  return (
    <PostForm form={form} submitLabel="Add response" hidden={{ intent: "response-add" }} {...ADD_ROW_FORM}>
      <Field label="Key" hint="e.g. holes" {...fieldProps(fields.key)} />
      <Field label="Response name" {...fieldProps(fields.name)} />
      <Field label="Unit" {...fieldProps(fields.unit)} />
      <SelectField label="Kind" options={RESPONSE_KINDS} {...fieldProps(fields.kind)} />
      <Field label="Decimals" inputMode="numeric" {...fieldProps(fields.decimals)} />
      <Field label="Lowest plausible value" inputMode="decimal" {...fieldProps(fields.plausibleMin)} />
      <Field label="Highest plausible value" inputMode="decimal" {...fieldProps(fields.plausibleMax)} />
    </PostForm>
  );
}

type Target = { target: number; tolerance: number } | undefined;

const SLUMP_UNITS = [
  { value: "mm", label: "mm" },
  { value: "in", label: "in" },
];

function TargetsForm({ reply, slump, air }: FormArgs & { slump: Target; air: Target }) {
  const [form, fields] = useSchemaForm(setupForms.targets, {
    reply,
    intent: "targets",
    defaultValue: {
      slumpTarget: slump ? String(slump.target) : "",
      slumpUnit: "mm",
      slumpTolerance: slump ? String(slump.tolerance) : "",
      airTarget: air ? String(air.target) : "",
      airTolerance: air ? String(air.tolerance) : "",
    },
  });
  return (
    <PostForm form={form} submitLabel="Save targets" hidden={{ intent: "targets" }} className="grid gap-4 md:grid-cols-3" errorsClassName="md:col-span-3" submitClassName="self-end">
      <Field label="Slump target" inputMode="decimal" {...fieldProps(fields.slumpTarget)} />
      <SelectField label="Slump unit" options={SLUMP_UNITS} {...fieldProps(fields.slumpUnit)} />
      <Field label="Slump tolerance ±" inputMode="decimal" hint="Blank: the usual tolerance for the target (ASTM C94)" {...fieldProps(fields.slumpTolerance)} />
      <Field label="Air content target, %" inputMode="decimal" {...fieldProps(fields.airTarget)} />
      <Field
        label="Air content tolerance ±, percentage points"
        inputMode="decimal"
        hint="Blank: ± 1.5 points (ASTM C94)"
        {...fieldProps(fields.airTolerance)}
      />
    </PostForm>
  );
}

function ProtocolForm({ reply }: FormArgs) {
  const [form, fields] = useSchemaForm(protocolSchema, { reply, intent: "protocol" });
  return (
    <PostForm form={form} submitLabel="Upload protocol" hidden={{ intent: "protocol" }} encType="multipart/form-data" className="flex flex-wrap items-end gap-4">
      <Field label="Protocol (PDF, up to 10 MB)" type="file" accept="application/pdf" {...fieldProps(fields.protocol)} defaultValue={undefined} />
    </PostForm>
  );
}

function MaterialForm({ reply }: FormArgs) {
  const [form, fields] = useSchemaForm(setupForms.materialAdd, { reply, intent: "material-add" });
  return (
    <PostForm form={form} submitLabel="Add material" hidden={{ intent: "material-add" }} {...ADD_ROW_FORM}>
      <Field label="Material code" hint="e.g. M1" {...fieldProps(fields.code)} />
      <Field label="Description" {...fieldProps(fields.description)} />
    </PostForm>
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
  reply,
  busy,
  candidates,
}: FormArgs & {
  busy: boolean;
  title: string;
  kind: "coordinator" | "reviewer";
  /** Whom the e-mail field suggests, and who is left out and why (reviewers of a participating lab). */
  candidates?: { offered: { email: string; name: string }[]; leftOut: { email: string; name: string; labName: string }[] } | null;
  people: { id: number; name: string; email: string; owner: boolean }[];
  canChange: boolean;
  /** Why the list cannot change in the study's state (~/lib/write-rules), shown instead of the controls. */
  fixedBecause: string | null;
}) {
  const [form, fields] = useSchemaForm(kind === "coordinator" ? setupForms.coordinatorAdd : setupForms.reviewerAdd, { reply, intent: `${kind}-add` });
  return (
    <Card title={title}>
      {fixedBecause && <p className="mb-3 text-basalt-700">{fixedBecause}</p>}
      <ul className="mb-3 flex flex-col gap-2">
        {people.length === 0 && <li>Nobody yet.</li>}
        {people.map((p) => (
          <li key={p.id} className="flex flex-wrap items-center justify-between gap-2">
            <span>
              {p.name} <span className="text-sm text-basalt-700">{p.email}</span> {p.owner && <Badge>Owner</Badge>}
            </span>
            {canChange && !p.owner && <RemoveButton intent={`${kind}-remove`} id={p.id} label={`Remove ${p.name}`} busy={busy} />}
          </li>
        ))}
      </ul>
      <FormErrors errors={refusalOf(reply, `${kind}-remove`)} />
      {canChange && (
        <PostForm form={form} submitLabel="Add" hidden={{ intent: `${kind}-add` }} className="flex flex-wrap items-end gap-3">
          <Field
            label={`Add ${kind === "coordinator" ? "co-coordinator" : "reviewer"} by e-mail`}
            type="email"
            list={candidates ? `${kind}-candidates` : undefined}
            {...fieldProps(fields.email)}
          />
          {candidates && (
            <datalist id={`${kind}-candidates`}>
              {candidates.offered.map((c) => (
                <option key={c.email} value={c.email}>
                  {c.name}
                </option>
              ))}
            </datalist>
          )}
        </PostForm>
      )}
      {canChange && candidates && candidates.leftOut.length > 0 && (
        <ul className="mt-3 text-sm text-basalt-700">
          {candidates.leftOut.map((c) => (
            <li key={c.email}>
              Not offered: {c.name} works at a participating lab ({c.labName}).
            </li>
          ))}
        </ul>
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
    cell: (row: Row) => <RemoveButton intent={intent} id={row.id} label={label(row)} busy={busy} />,
  };
}

/** A "Remove" button that posts `intent` with the id of what it removes; `label` names that for screen readers. */
function RemoveButton({ intent, id, label, busy }: { intent: string; id: number; label: string; busy: boolean }) {
  return (
    <Form method="post">
      <input type="hidden" name="intent" value={intent} />
      <input type="hidden" name="id" value={id} />
      <Button type="submit" variant="secondary" aria-label={label} disabled={busy}>
        Remove
      </Button>
    </Form>
  );
}
