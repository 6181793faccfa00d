import type { Route } from "./+types/assigned-values";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { groupFields, replyFor } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Field, Notice, SelectField } from "~/components/ui";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { assignmentSchema } from "~/lib/round-forms";
import { hasPublishedPrecision, roundDesign, saveAssignment, scoreRound } from "~/models/round.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRound } from "~/server/round-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Assigned values & σ_pt" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRound(context, ["coordinator", "admin"]);
  const [{ groups, settings }, scored] = await Promise.all([roundDesign(study.id), scoreRound(study)]);
  return {
    editable: access === "coordinator" && writeRefusal("roundChoices", study.state) === null,
    refusal: writeRefusal("roundChoices", study.state),
    sourceCode: settings.precision.sourceCode,
    groups: groups.map((group, index) => ({
      ...group,
      hasPrecision: hasPublishedPrecision(settings.precision, group.response.key),
      scored: scored[index]!,
    })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRound(context, ["coordinator"]);
  return submitForm(request, assignmentSchema, (value) => saveAssignment(study, user.id, value), () => redirectWithToast(`/rounds/${study.id}/assigned-values`, "Choice saved."));
}

type Group = Route.ComponentProps["loaderData"]["groups"][number];

function AssignmentForm({ group, editable, reply }: { group: Group; editable: boolean; reply: unknown }) {
  const { material, response, assignment, scored } = group;
  const [form, fields] = useSchemaForm(assignmentSchema, {
    reply: replyFor(reply, material.id, response.id),
    id: `assignment-${material.id}-${response.id}`,
    defaultValue: {
      assignedMethod: assignment?.assignedMethod,
      referenceValue: assignment?.referenceValue?.toString() ?? "",
      referenceUncertainty: assignment?.referenceUncertainty?.toString() ?? "",
      sigmaMethod: assignment?.sigmaMethod,
      fixedSigma: assignment?.fixedSigma?.toString() ?? "",
    },
  });
  const d = figureDecimals(response.decimals);
  const unit = response.unit ? ` ${response.unit}` : "";
  return (
    <Card title={`${material.code} · ${response.name}`}>
      {scored.scores ? (
        <dl className="mb-4 grid gap-1 sm:grid-cols-[14rem_1fr]">
          <dt className="font-semibold">Assigned value x_pt</dt>
          <dd>
            {formatFigure(scored.scores.assignedValue, d.mean)}
            {unit}, u(x_pt) = {formatFigure(scored.scores.assignedUncertainty, d.sd)}
          </dd>
          <dt className="font-semibold">σ_pt</dt>
          <dd>
            {formatFigure(scored.scores.sigmaPt, d.sd)}
            {unit}
          </dd>
          <dt className="font-semibold">Robust x* and s* of the results</dt>
          <dd>
            {formatFigure(scored.scores.robust.robustMean, d.mean)} and {formatFigure(scored.scores.robust.robustSd, d.sd)} from {scored.scores.robust.count} labs
          </dd>
          <dt className="font-semibold">Basis</dt>
          <dd>
            {scored.assignedBasis} {scored.sigmaBasis}
          </dd>
        </dl>
      ) : (
        <Notice tone="caution">{scored.refusal}</Notice>
      )}
      {scored.scores && !scored.scores.uncertaintyNegligible && (
        <Notice tone="caution">u(x_pt) exceeds 0.3·σ_pt (ISO 13528 9.2.1): labs are judged by z′, which allows for it.</Notice>
      )}
      {editable && (
        <PostForm form={form} submitLabel="Save choice" hidden={groupFields("assignment", group)} className="mt-4 grid gap-3 sm:grid-cols-2" errorsClassName="sm:col-span-2" submitClassName="self-end">
          <SelectField
            label="Assigned value"
            {...fieldProps(fields.assignedMethod)}
            options={[
              { value: "consensus", label: "Consensus of the labs (Algorithm A)" },
              { value: "reference", label: "Reference value with its uncertainty" },
            ]}
          />
          <SelectField
            label="σ_pt"
            {...fieldProps(fields.sigmaMethod)}
            options={[
              ...(group.hasPrecision ? [{ value: "precision", label: "From the method's published precision" }] : []),
              { value: "robust", label: "Robust s* of this round" },
              { value: "fixed", label: "Fixed value for fitness for purpose" },
            ]}
          />
          <Field label="Reference value" inputMode="decimal" hint="Only with a reference value." {...fieldProps(fields.referenceValue)} />
          <Field label="Its standard uncertainty" inputMode="decimal" {...fieldProps(fields.referenceUncertainty)} />
          <Field label="Fixed σ_pt" inputMode="decimal" hint="Only with a fixed value." {...fieldProps(fields.fixedSigma)} />
        </PostForm>
      )}
    </Card>
  );
}

export default function AssignedValues({ loaderData, actionData }: Route.ComponentProps) {
  const { groups, editable, sourceCode, refusal } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      {refusal && <Notice>{refusal}</Notice>}
      <p className="text-basalt-700">
        Each material and response gets an assigned value and a σ_pt; the choice and its basis appear in the round report and in every lab's letter.
        {sourceCode ? ` Published precision comes from study ${sourceCode}.` : " This round was not set up from a published study, so σ_pt comes from the round or a fixed value."}
      </p>
      {groups.map((group) => (
        <AssignmentForm key={`${group.material.id}-${group.response.id}`} group={group} editable={editable} reply={actionData} />
      ))}
    </div>
  );
}
