import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/labs";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field, PageHeader, SimpleTable } from "~/components/ui";
import { labSchema } from "~/lib/account-forms";
import { wholeNumberParam } from "~/lib/query-params";
import { createLab, listLabs, updateLab } from "~/models/lab.server";
import { recordAudit } from "~/server/audit.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Labs · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const labs = await listLabs();
  // `?edit=<id>` opens that lab's entry in the form.
  const editId = wholeNumberParam(new URL(request.url).searchParams, "edit");
  return { labs, editing: labs.find((l) => l.id === editId) ?? null };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const submission = parseWithZod(await request.formData(), { schema: labSchema });
  if (submission.status !== "success") return refuse(submission);
  const { labId, ...entry } = submission.value;
  const saved = await withRefusals(submission, async () => {
    const lab = labId ? await updateLab(labId, entry) : await createLab(entry);
    await recordAudit({ actorUserId: admin.id, action: labId ? "lab_updated" : "lab_created", entityType: "lab", entityId: lab.id, after: entry });
    return lab;
  });
  if (!saved.ok) return saved.reply;
  const { pathname, search } = new URL(request.url);
  return redirectWithToast(pathname + search, `${saved.value.name} ${labId ? "saved" : "added"}.`);
}

export default function AdminLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { editing } = loaderData;
  const [form, fields] = useSchemaForm(labSchema, { reply: actionData, id: `lab-${editing?.id ?? "new"}`, defaultValue: editing ? labValues(editing) : undefined });
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title="Labs" subtitle="The lab directory: every laboratory that can be invited to a study." />
      <Card title={editing ? `Edit ${editing.name}` : "New lab"} className="my-6">
        <Form method="post" className="grid gap-4 md:grid-cols-2" key={editing?.id ?? "new"} {...getFormProps(form)}>
          {editing && <input type="hidden" name="labId" value={editing.id} />}
          <FormErrors errors={formWideErrors(form)} />
          <Field label="Name" {...fieldProps(fields.name)} />
          <Field label="Address" {...fieldProps(fields.address)} />
          <Field label="Contact name" {...fieldProps(fields.contactName)} />
          <Field label="Contact e-mail" type="email" {...fieldProps(fields.contactEmail)} />
          <Field label="Accreditation number" {...fieldProps(fields.accreditationNumber)} />
          <div className="md:col-span-2">
            <Button type="submit" disabled={busy}>{editing ? "Save lab" : "Add lab"}</Button>
            {editing && (
              <Link to="/admin/labs" className="ml-4 font-semibold text-basalt-700 underline">
                Cancel
              </Link>
            )}
          </div>
        </Form>
      </Card>
      <Card title="Directory">
        <SimpleTable
          caption="All labs"
          headers={["Name", "Address", "Contact", "Accreditation", ""]}
          rows={loaderData.labs.map((l) => [
            l.name,
            l.address,
            <span key="c">
              {l.contactName}
              {l.contactEmail && <span className="block text-sm text-basalt-700">{l.contactEmail}</span>}
            </span>,
            l.accreditationNumber || "—",
            <Link key="edit" to={`?edit=${l.id}`} className="font-semibold text-basalt-700 underline" aria-label={`Edit ${l.name}`}>
              Edit
            </Link>,
          ])}
        />
      </Card>
    </>
  );
}

function labValues(lab: Route.ComponentProps["loaderData"]["labs"][number]) {
  const { name, address, contactName, contactEmail, accreditationNumber } = lab;
  return { name, address, contactName, contactEmail, accreditationNumber };
}
