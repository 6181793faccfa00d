import { Link } from "react-router";
import type { Route } from "./+types/new";
import { StatementCaution } from "~/components/statement-parts";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { Card, Field, PageHeader, SelectField, TextAreaField } from "~/components/ui";
import { comparisonSchema } from "~/lib/comparison/form";
import { publishedStatements, saveComparison } from "~/models/comparison.server";
import { submitForm } from "~/server/form-reply.server";
import { requireUser } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "New comparison · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request);
  return { statements: await publishedStatements() };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  return submitForm(request, comparisonSchema, (value) => saveComparison(user.id, value), (id) => redirectWithToast(`/compare/${id}`, "Comparison saved to your history."));
}

const SETTINGS = [
  { value: "same-lab", label: "Both mixtures tested in the same lab (repeatability conditions)" },
  { value: "two-labs", label: "Each mixture tested in a different lab" },
];

export default function NewComparison({ loaderData, actionData }: Route.ComponentProps) {
  const { statements } = loaderData;
  const [form, fields] = useSchemaForm(comparisonSchema, { reply: actionData, id: "comparison", defaultValue: { setting: "same-lab" } });
  const options = statements.flatMap((s) =>
    s.responses.map((r) => ({
      value: `${s.id}:${r.key}`,
      label: `${s.studyCode} statement v${s.version} — ${r.name} (levels ${r.levels![0].toFixed(1)}–${r.levels![1].toFixed(1)} ${r.unit})`,
    })),
  );
  return (
    <>
      <PageHeader
        title="Compare two mixtures"
        subtitle="Is the difference between a trial mixture and a reference mixture larger than the test's own scatter? The published precision statement decides."
        actions={
          <Link to="/compare" className="font-semibold text-basalt-800 underline">
            Your comparisons
          </Link>
        }
      />
      <div className="flex flex-col gap-6">
        {options.length === 0 ? (
          <Card>
            <p>No precision statement has been published yet; a comparison needs one.</p>
          </Card>
        ) : (
          <Card>
            <PostForm form={form} submitLabel="Compare" busyLabel="Comparing…">
              <SelectField
                label="Precision statement and response"
                options={[{ value: "", label: "Choose…" }, ...options]}
                {...fieldProps(fields.basis)}
              />
              <SelectField label="Where the mixtures were tested" options={SETTINGS} {...fieldProps(fields.setting)} />
              <div className="grid gap-4 md:grid-cols-2">
                <fieldset className="flex flex-col gap-3">
                  <legend className="mb-1 font-semibold text-basalt-800">Reference mixture (the one you trust)</legend>
                  <Field label="Name" {...fieldProps(fields.referenceLabel)} />
                  <Field label="Results" hint="One or more replicate results, separated by commas or spaces, e.g. 13, 14, 13" {...fieldProps(fields.referenceValues)} />
                </fieldset>
                <fieldset className="flex flex-col gap-3">
                  <legend className="mb-1 font-semibold text-basalt-800">Trial mixture</legend>
                  <Field label="Name" {...fieldProps(fields.trialLabel)} />
                  <Field label="Results" hint="One or more replicate results, separated by commas or spaces" {...fieldProps(fields.trialValues)} />
                </fieldset>
              </div>
              <TextAreaField label="Notes (optional)" rows={3} {...fieldProps(fields.notes)} />
            </PostForm>
          </Card>
        )}
        <StatementCaution />
      </div>
    </>
  );
}
