import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/labs";
import { wholeNumberParam } from "~/lib/query-params";
import { Button, Card, Field, Notice, PageHeader, SimpleTable } from "~/components/ui";
import { recordAudit } from "~/server/audit.server";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { requireRole } from "~/server/guards.server";
import { emailField, idField, nameField } from "~/lib/validation";
import { createLab, listLabs, updateLab } from "~/models/lab.server";
import { AccountError } from "~/models/user.server";

export const meta: Route.MetaFunction = () => [{ title: "Labs · Ringbatch" }];

const labSchema = z.object({
  name: nameField,
  address: z.string().trim().max(300, { message: "Keep the address to 300 characters." }),
  contactName: z.string().trim().max(120),
  contactEmail: z.union([z.literal(""), emailField]),
  accreditationNumber: z.string().trim().max(60, { message: "Keep the accreditation number to 60 characters." }),
});

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const labs = await listLabs();
  // `?edit=<id>` opens that lab's entry in the form.
  const editId = wholeNumberParam(new URL(request.url).searchParams, "edit");
  return { labs, editing: labs.find((l) => l.id === editId) ?? null };
}

type ActionResult = { errors?: FieldErrors; values?: Record<string, string>; done?: string };

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const form = await request.formData();
  const parsed = parseForm(labSchema, form);
  if (!parsed.ok) return data<ActionResult>({ errors: parsed.errors, values: parsed.values }, { status: 400 });
  const labId = form.get("labId") ? idField.safeParse(form.get("labId")) : null;
  if (labId && !labId.success) return data<ActionResult>({ errors: { form: "That lab no longer exists." }, values: parsed.values }, { status: 400 });
  try {
    if (labId) {
      const lab = await updateLab(labId.data, parsed.data);
      await recordAudit({ actorUserId: admin.id, action: "lab_updated", entityType: "lab", entityId: lab.id, after: parsed.data });
      return { done: `${lab.name} saved.` } satisfies ActionResult;
    }
    const lab = await createLab(parsed.data);
    await recordAudit({ actorUserId: admin.id, action: "lab_created", entityType: "lab", entityId: lab.id, after: parsed.data });
    return { done: `${lab.name} added.` } satisfies ActionResult;
  } catch (error) {
    if (error instanceof AccountError) return data<ActionResult>({ errors: { [error.field]: error.message }, values: parsed.data }, { status: 400 });
    throw error;
  }
}

export default function AdminLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { editing } = loaderData;
  const result = actionData as ActionResult | undefined;
  const { errors, onSubmit } = useSchemaCheck(labSchema, result?.errors ?? {});
  // After a save the form shows what was saved; on an error, what was typed.
  const values: Record<string, string> = result?.values ?? (editing ? labValues(editing) : {});
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title="Labs" subtitle="The lab directory: every laboratory that can be invited to a study." />
      {result?.done && <Notice tone="success">{result.done}</Notice>}
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <Card title={editing ? `Edit ${editing.name}` : "New lab"} className="my-6">
        <Form method="post" className="grid gap-4 md:grid-cols-2" key={editing?.id ?? "new"} onSubmit={onSubmit} noValidate>
          {editing && <input type="hidden" name="labId" value={editing.id} />}
          <Field label="Name" name="name" defaultValue={values.name} error={errors.name} required />
          <Field label="Address" name="address" defaultValue={values.address} error={errors.address} />
          <Field label="Contact name" name="contactName" defaultValue={values.contactName} error={errors.contactName} />
          <Field label="Contact e-mail" name="contactEmail" type="email" defaultValue={values.contactEmail} error={errors.contactEmail} />
          <Field label="Accreditation number" name="accreditationNumber" defaultValue={values.accreditationNumber} error={errors.accreditationNumber} />
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

function labValues(lab: Route.ComponentProps["loaderData"]["labs"][number]): Record<string, string> {
  const { name, address, contactName, contactEmail, accreditationNumber } = lab;
  return { name, address, contactName, contactEmail, accreditationNumber };
}
