import type { Route } from "./+types/new";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { Card, Field, PageHeader, SelectField, TextAreaField } from "~/components/ui";
import { newRuggednessSchema } from "~/lib/ruggedness/forms";
import { createRuggednessStudy } from "~/models/ruggedness.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "New ruggedness study · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "coordinator");
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "coordinator");
  return submitForm(request, newRuggednessSchema, (value) => createRuggednessStudy(user.id, value), (created) => redirectWithToast(`/ruggedness/${created.id}`, `Ruggedness study ${created.code} created; now name its factors.`));
}

const TEMPLATES = [
  { value: "float_finishing", label: "Float finishing test of fresh concrete (passes to close the holes, passes to the target surface)" },
  { value: "custom", label: "Another test method, one response" },
];

export default function NewRuggednessStudy({ actionData }: Route.ComponentProps) {
  const [form, fields] = useSchemaForm(newRuggednessSchema, { reply: actionData, id: "new-ruggedness", defaultValue: { template: "float_finishing" } });
  return (
    <>
      <PageHeader title="New ruggedness study" subtitle="A single-lab screening of the procedure's details; you lay out the factors next." />
      <Card>
        <PostForm form={form} submitLabel="Create the study" busyLabel="Creating…" className="flex max-w-2xl flex-col gap-4">
          <Field label="Code" hint="2–30 letters, digits and hyphens, such as RG-2027-1" {...fieldProps(fields.code)} />
          <Field label="Title" {...fieldProps(fields.title)} />
          <SelectField label="Test method" options={TEMPLATES} {...fieldProps(fields.template)} />
          <fieldset className="flex flex-col gap-3 rounded-md border border-basalt-100 p-3">
            <legend className="px-1 text-sm font-semibold text-basalt-700">Only for another test method</legend>
            <Field label="Test method name" {...fieldProps(fields.testMethod)} />
            <Field label="Response name" hint="What the test measures, e.g. Slump" {...fieldProps(fields.responseName)} />
            <Field label="Response unit" hint="e.g. mm" {...fieldProps(fields.responseUnit)} />
          </fieldset>
          <TextAreaField label="Notes (optional)" rows={3} {...fieldProps(fields.notes)} />
        </PostForm>
      </Card>
    </>
  );
}
