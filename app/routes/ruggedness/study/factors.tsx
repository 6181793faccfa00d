import { getFormProps } from "@conform-to/react";
import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/factors";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice, SelectField } from "~/components/ui";
import { factorsSchema, MAX_FACTORS } from "~/lib/ruggedness/forms";
import { ruggednessSetup, saveFactors } from "~/models/ruggedness.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRuggednessStudy } from "~/server/ruggedness-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Factors" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  return { setup: await ruggednessSetup(study.id), canEdit: access === "coordinator", designRefusal: writeRefusal("ruggednessDesign", study.state) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRuggednessStudy(context, ["coordinator"]);
  return submitForm(request, factorsSchema, (value) => saveFactors(study, user.id, value), (saved) => redirectWithToast(`/ruggedness/${study.id}/design`, `Design laid out: ${saved.runs} runs in a random order.`));
}

const REPLICATE_OPTIONS = [
  { value: "2", label: "Two results per run (effects tested against the replicate scatter)" },
  { value: "1", label: "One result per run (effects tested against the dummy columns)" },
];

/** The table's input columns, in order; each field's label reads "Factor 2 unit". */
const FACTOR_FIELDS = ["name", "unit", "low", "high"] as const;

export default function Factors({ loaderData, actionData }: Route.ComponentProps) {
  const { setup, canEdit, designRefusal } = loaderData;
  const locked = designRefusal !== null || setup.resultCount > 0;
  const rows = Array.from({ length: MAX_FACTORS }, (_, i) => {
    const f = setup.factors[i];
    return f ? { name: f.name, unit: f.unit, low: f.low, high: f.high } : {};
  });
  const [form, fields] = useSchemaForm(factorsSchema, {
    reply: actionData,
    id: "factors",
    defaultValue: { replicates: String(setup.plan?.replicates ?? 2), factors: rows },
  });
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-6">
      <Card>
        <p>
          Name the details of the procedure that might move the result, each with a low and a high setting a careful lab could plausibly use
          (ASTM E1169). Up to 7 factors take 8 runs, up to 11 take 12 runs; the design's spare columns become dummy columns, whose effects show
          the test's own scatter. Settings are free text, such as <em>5</em> and <em>10</em> with the unit <em>°</em>, or <em>Operator A</em> and{" "}
          <em>Operator B</em>.
        </p>
      </Card>
      {locked && <Notice tone="info">{designRefusal ?? "Results have been entered for this design, so the factors and the design are fixed."}</Notice>}
      {!canEdit && <Notice tone="info">Admins read this page; the study's coordinator changes it.</Notice>}
      <Card title="Factors and settings">
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={[...(form.errors ?? []), ...(fields.factors.errors ?? [])]} />
          {/* On a phone the factor table scrolls sideways inside the card; the region sits outside the fieldset, which may be disabled, so a keyboard can always scroll it. */}
          <div className="overflow-x-auto" role="region" aria-label="Factors, one per design column" tabIndex={0}>
            <fieldset disabled={locked || !canEdit} className="flex min-w-0 flex-col gap-4">
              <div className="max-w-xl">
                <SelectField label="Results per run" options={REPLICATE_OPTIONS} {...fieldProps(fields.replicates)} />
              </div>
              <table className="w-full border-collapse text-left">
                <caption className="sr-only">Factors, one per design column</caption>
                <thead>
                  <tr className="border-b-2 border-basalt-200">
                    {["Column", "Factor", "Unit", "Low setting (−)", "High setting (+)"].map((h) => (
                      <th key={h} scope="col" className="px-2 py-2 font-semibold text-basalt-800">
                        {h}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {fields.factors.getFieldList().map((row, i) => {
                    const f = row.getFieldset();
                    return (
                      <tr key={row.key} className="border-b border-basalt-100 align-top">
                        <th scope="row" className="px-2 py-2 font-semibold">
                          {i + 1}
                        </th>
                        {FACTOR_FIELDS.map((key) => (
                          <td key={key} className="px-2 py-1">
                            <Field label={`Factor ${i + 1} ${key}`} {...fieldProps(f[key])} />
                          </td>
                        ))}
                      </tr>
                    );
                  })}
                </tbody>
              </table>
              <div>
                <Button type="submit" disabled={busy}>
                  {busy ? "Laying out…" : setup.plan ? "Save and lay out the design again" : "Save and lay out the design"}
                </Button>
              </div>
            </fieldset>
          </div>
        </Form>
      </Card>
    </div>
  );
}
