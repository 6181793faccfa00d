import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/results";
import { ConcreteCaution } from "~/components/cautions";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import { NoDesignYet } from "~/components/no-design-yet";
import { RunHeading } from "~/components/run-heading";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, Notice } from "~/components/ui";
import { resultFieldName, ruggednessResultsSchema } from "~/lib/ruggedness/forms";
import { ruggednessResultsByResponse, ruggednessSetup, saveRuggednessResults, type ResultEntry } from "~/models/ruggedness.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireRuggednessStudy } from "~/server/ruggedness-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Results" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  const setup = await ruggednessSetup(study.id);
  const stored: Record<string, string> = {};
  if (setup.plan) {
    const { rows } = await ruggednessResultsByResponse(study.id, setup.plan.runs);
    for (const r of rows) stored[resultFieldName(r.run, r.replicate, r.key)] = String(r.value);
  }
  const refusal = writeRefusal("ruggednessResults", study.state);
  return { studyId: study.id, setup, stored, canEdit: access === "coordinator" && refusal === null, refusal };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRuggednessStudy(context, ["coordinator"]);
  const setup = await ruggednessSetup(study.id);
  if (!setup.plan) notFound();
  const { runs, replicates } = setup.plan;
  const submission = parseWithZod(await request.formData(), { schema: ruggednessResultsSchema(runs, replicates, setup.responses) });
  if (submission.status !== "success") return refuse(submission);
  const entries: ResultEntry[] = [];
  for (let run = 1; run <= runs; run++)
    for (let replicate = 1; replicate <= replicates; replicate++)
      for (const r of setup.responses) {
        const value = submission.value[resultFieldName(run, replicate, r.key)];
        if (value !== undefined) entries.push({ run, replicate, responseKey: r.key, value });
      }
  const saved = await withRefusals(submission, () => saveRuggednessResults(study, user.id, entries));
  if (!saved.ok) return saved.reply;
  return redirectWithToast(`/ruggedness/${study.id}/results`, `Results saved (${saved.value} in all).`);
}

export default function ResultsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { studyId, setup, stored, canEdit, refusal } = loaderData;
  if (!setup.plan) {
    return <NoDesignYet studyId={studyId} />;
  }
  return <ResultsForm plan={setup.plan} responses={setup.responses} stored={stored} canEdit={canEdit} refusal={refusal} actionData={actionData} />;
}

function ResultsForm({
  plan,
  responses,
  stored,
  canEdit,
  refusal,
  actionData,
}: {
  plan: NonNullable<Route.ComponentProps["loaderData"]["setup"]["plan"]>;
  responses: Route.ComponentProps["loaderData"]["setup"]["responses"];
  stored: Record<string, string>;
  canEdit: boolean;
  refusal: string | null;
  actionData: unknown;
}) {
  const schema = ruggednessResultsSchema(plan.runs, plan.replicates, responses);
  const [form, fields] = useSchemaForm(schema, { reply: actionData, id: "ruggedness-results", defaultValue: stored });
  const busy = useNavigation().state === "submitting";
  const replicates = Array.from({ length: plan.replicates }, (_, k) => k + 1);
  return (
    <div className="flex flex-col gap-6">
      <ConcreteCaution heavy />
      {!canEdit && <Notice tone="info">{refusal ?? "Admins read this page; the study's coordinator enters the results."}</Notice>}
      <Card title="Results by run, in the order performed">
        <p className="mb-3 text-basalt-700">Leave a box empty until the run is done; a box left empty changes nothing already saved.</p>
        <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
          <FormErrors errors={form.errors} />
          <fieldset disabled={!canEdit} className="flex flex-col gap-3">
            {plan.runOrder.map((run, position) => (
              <div key={run} className="rounded-md border border-basalt-100 p-3">
                <RunHeading run={run} position={position} className="mb-2 font-semibold" />
                <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                  {responses.flatMap((r) =>
                    replicates.map((k) => {
                      const name = resultFieldName(run, k, r.key);
                      return (
                        <Field
                          key={name}
                          label={`${r.name}${plan.replicates > 1 ? `, result ${k}` : ""} (${r.unit || "value"})`}
                          inputMode={r.kind === "count" ? "numeric" : "decimal"}
                          {...fieldProps(fields[name]!)}
                        />
                      );
                    }),
                  )}
                </div>
              </div>
            ))}
            <div>
              <Button type="submit" disabled={busy}>
                {busy ? "Saving…" : "Save the results"}
              </Button>
            </div>
          </fieldset>
        </Form>
      </Card>
    </div>
  );
}
