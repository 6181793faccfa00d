import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/admin.labs";
import { Button, Card, Field, Notice, PageHeader, SimpleTable } from "~/components/ui";
import { recordAudit } from "~/lib/audit.server";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { requireRole } from "~/lib/guards.server";
import { emailField, nameField } from "~/lib/validation";
import { createLab, listLabs } from "~/models/lab.server";
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
  return { labs: await listLabs() };
}

type ActionResult = { errors?: FieldErrors; values?: Record<string, string>; done?: string };

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const parsed = parseForm(labSchema, await request.formData());
  if (!parsed.ok) return data<ActionResult>({ errors: parsed.errors, values: parsed.values }, { status: 400 });
  try {
    const lab = await createLab(parsed.data);
    await recordAudit({ actorUserId: admin.id, action: "lab_created", entityType: "lab", entityId: lab.id, after: parsed.data });
    return { done: `${lab.name} added.` } satisfies ActionResult;
  } catch (error) {
    if (error instanceof AccountError) return data<ActionResult>({ errors: { [error.field]: error.message }, values: parsed.data }, { status: 400 });
    throw error;
  }
}

export default function AdminLabs({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const errors = result?.errors ?? {};
  const values = result?.values ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title="Labs" subtitle="The lab directory: every laboratory that can be invited to a study." />
      {result?.done && <Notice tone="success">{result.done}</Notice>}
      <Card title="New lab" className="my-6">
        <Form method="post" className="grid gap-4 md:grid-cols-2">
          <Field label="Name" name="name" defaultValue={values.name} error={errors.name} required />
          <Field label="Address" name="address" defaultValue={values.address} error={errors.address} />
          <Field label="Contact name" name="contactName" defaultValue={values.contactName} error={errors.contactName} />
          <Field label="Contact e-mail" name="contactEmail" type="email" defaultValue={values.contactEmail} error={errors.contactEmail} />
          <Field label="Accreditation number" name="accreditationNumber" defaultValue={values.accreditationNumber} error={errors.accreditationNumber} />
          <div className="md:col-span-2">
            <Button type="submit" disabled={busy}>Add lab</Button>
          </div>
        </Form>
      </Card>
      <Card title="Directory">
        <SimpleTable
          caption="All labs"
          headers={["Name", "Address", "Contact", "Accreditation"]}
          rows={loaderData.labs.map((l) => [
            l.name,
            l.address,
            <span key="c">
              {l.contactName}
              {l.contactEmail && <span className="block text-sm text-basalt-700">{l.contactEmail}</span>}
            </span>,
            l.accreditationNumber || "—",
          ])}
        />
      </Card>
    </>
  );
}
