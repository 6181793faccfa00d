import { getFormProps } from "@conform-to/react";
import { z } from "zod";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/labs";
import { ConfirmStep } from "~/components/confirm-dialog";
import { fieldProps, FormErrors, formWideErrors, refusalOf, useSchemaForm } from "~/components/forms";
import { Badge, Button, Card, Field, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import { labCheckedSchema, labMergeSchema, labSchema } from "~/lib/account-forms";
import { wholeNumberParam } from "~/lib/query-params";
import { createLab, listLabsForAdmin, markLabChecked, mergeLab, updateLab } from "~/models/lab.server";
import { recordAudit } from "~/server/audit.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Labs · Ringbatch" }];

const saveLabSchema = labSchema.extend({ intent: z.literal("save") });
const adminLabsSchema = z.discriminatedUnion("intent", [saveLabSchema, labMergeSchema, labCheckedSchema]);

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const labs = await listLabsForAdmin();
  const params = new URL(request.url).searchParams;
  // `?edit=<id>` opens that lab's entry in the form; `?merge=<id>` the merge of that lab into another.
  const editId = wholeNumberParam(params, "edit");
  const mergeId = wholeNumberParam(params, "merge");
  return { labs, editing: labs.find((l) => l.id === editId) ?? null, merging: labs.find((l) => l.id === mergeId) ?? null };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const change = async (input: z.output<typeof adminLabsSchema>) => {
    switch (input.intent) {
      case "save": {
        const { labId, intent: _intent, ...entry } = input;
        const lab = labId ? await updateLab(labId, entry) : await createLab(entry);
        await recordAudit({ actorUserId: admin.id, action: labId ? "lab_updated" : "lab_created", entityType: "lab", entityId: lab.id, after: entry });
        return { to: null, message: `${lab.name} ${labId ? "saved" : "added"}.` };
      }
      case "merge": {
        const merged = await mergeLab(input.labId, input.intoLabId, admin.id);
        return { to: "/admin/labs", message: `${merged.from.name} merged into ${merged.into.name}.` };
      }
      case "checked": {
        await markLabChecked(input.labId, admin.id);
        return { to: null, message: "Marked as checked: no duplicate." };
      }
    }
  };
  const { pathname, search } = new URL(request.url);
  return submitForm(request, adminLabsSchema, change, ({ to, message }) => redirectWithToast(to ?? pathname + search, message));
}

type LabRow = Route.ComponentProps["loaderData"]["labs"][number];

export default function AdminLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { editing, merging, labs } = loaderData;
  const busy = useNavigation().state === "submitting";
  const checkRefusal = refusalOf(actionData, "checked");
  return (
    <>
      <PageHeader title="Labs" subtitle="The lab directory: every laboratory that can be invited to a study." />
      {merging && <MergeCard lab={merging} labs={labs} reply={actionData} busy={busy} />}
      <LabEntryCard key={editing?.id ?? "new"} lab={editing} reply={actionData} busy={busy} />
      <Card title="Directory">
        <p className="mb-4">
          A lab a coordinator invites from outside the directory joins it only when its contact accepts, and then shows here marked "New — check for
          duplicates". Until then, and after a decline, it is in no list of labs: only the labs page of the study that invited it shows it, from where the
          coordinator may invite it again.
        </p>
        <FormErrors errors={checkRefusal} />
        <SimpleTable
          caption="All labs"
          headers={["Name", "Address", "Contact", "Accreditation", ""]}
          rows={labs.map((l) => [
            <span key="name">
              {l.name}
              {l.listing === "unchecked" && (
                <span className="block">
                  <Badge tone="ochre">New — check for duplicates</Badge>
                </span>
              )}
            </span>,
            l.address,
            <span key="c">
              {l.contactName}
              {l.contactEmail && <span className="block text-sm text-basalt-700">{l.contactEmail}</span>}
            </span>,
            l.accreditationNumber || "—",
            <LabActions key="actions" lab={l} busy={busy} />,
          ])}
        />
      </Card>
    </>
  );
}

/** A new lab for the directory, or the entry of `lab` when one is being edited. */
function LabEntryCard({ lab, reply, busy }: { lab: LabRow | null; reply: unknown; busy: boolean }) {
  const [form, fields] = useSchemaForm(saveLabSchema, { reply, intent: "save", id: `lab-${lab?.id ?? "new"}`, defaultValue: lab ? labValues(lab) : undefined });
  return (
    <Card title={lab ? `Edit ${lab.name}` : "New lab"} className="my-6">
      <Form method="post" className="grid gap-4 md:grid-cols-2" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="save" />
        {lab && <input type="hidden" name="labId" value={lab.id} />}
        <FormErrors errors={formWideErrors(form)} />
        <Field label="Name" {...fieldProps(fields.name)} />
        <Field label="Address" {...fieldProps(fields.address)} />
        <Field label="Contact name" {...fieldProps(fields.contactName)} />
        <Field label="Contact e-mail" type="email" {...fieldProps(fields.contactEmail)} />
        <Field label="Accreditation number" {...fieldProps(fields.accreditationNumber)} />
        <div className="md:col-span-2">
          <Button type="submit" disabled={busy}>
            {lab ? "Save lab" : "Add lab"}
          </Button>
          {lab && (
            <Link to="/admin/labs" className="ml-4 font-semibold text-basalt-700 underline">
              Cancel
            </Link>
          )}
        </div>
      </Form>
    </Card>
  );
}

function LabActions({ lab, busy }: { lab: LabRow; busy: boolean }) {
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
      <Link to={`?edit=${lab.id}`} className="font-semibold text-basalt-700 underline" aria-label={`Edit ${lab.name}`}>
        Edit
      </Link>
      <Link to={`?merge=${lab.id}`} className="font-semibold text-basalt-700 underline" aria-label={`Merge ${lab.name} into another lab`}>
        Merge…
      </Link>
      {lab.listing === "unchecked" && (
        <Form method="post">
          <input type="hidden" name="intent" value="checked" />
          <input type="hidden" name="labId" value={lab.id} />
          <Button type="submit" variant="secondary" disabled={busy} aria-label={`Mark ${lab.name} as checked: no duplicate`}>
            No duplicate
          </Button>
        </Form>
      )}
    </div>
  );
}

/** Merging `lab` into another lab of the directory, behind a confirmation that says what moves. */
function MergeCard({ lab, labs, reply, busy }: { lab: LabRow; labs: LabRow[]; reply: unknown; busy: boolean }) {
  const [form, fields] = useSchemaForm(labMergeSchema, { reply, intent: "merge" });
  const targets = labs.filter((l) => l.id !== lab.id).map((l) => ({ value: String(l.id), label: l.name }));
  const studies = lab.studyCodes.length ? `its ${lab.studyCodes.length === 1 ? "enrollment" : `${lab.studyCodes.length} enrollments`} (${lab.studyCodes.join(", ")}), with their shipments, results, queries and decisions` : "no enrollments";
  const people = lab.memberEmails.length ? `${lab.memberEmails.length === 1 ? "1 person" : `${lab.memberEmails.length} people`} (${lab.memberEmails.join(", ")})` : "no people";
  return (
    <Card title={`Merge ${lab.name} into another lab`} className="mt-6">
      <Form method="post" className="grid gap-4 md:grid-cols-2" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="merge" />
        <input type="hidden" name="labId" value={lab.id} />
        <FormErrors errors={formWideErrors(form)} />
        <p className="md:col-span-2">
          Moves {studies}, and {people}. {lab.name} then leaves the directory and every list of labs; the audit trail keeps its history.
        </p>
        <SelectField label="Merge into" options={[{ value: "", label: "Choose a lab" }, ...targets]} {...fieldProps(fields.intoLabId)} />
        <div className="flex items-end gap-4">
          <ConfirmStep
            label="Merge…"
            title={`Merge ${lab.name}?`}
            consequences={
              <>
                <p>
                  These move to the lab you chose: {studies}; {people}.
                </p>
                <p>{lab.name} leaves the directory and every list of labs. This cannot be undone.</p>
              </>
            }
            confirmLabel="Merge the labs"
            variant="danger"
            disabled={busy}
          />
          <Link to="/admin/labs" className="font-semibold text-basalt-700 underline">
            Cancel
          </Link>
        </div>
      </Form>
    </Card>
  );
}

function labValues(lab: LabRow) {
  const { name, address, contactName, contactEmail, accreditationNumber } = lab;
  return { name, address, contactName, contactEmail, accreditationNumber };
}
