import type { Route } from "./+types/material-checks";
import { fieldProps, PostForm, useSchemaForm } from "~/components/forms";
import { ConcreteCaution } from "~/components/cautions";
import { groupFields, replyFor } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Card, Notice, TextAreaField } from "~/components/ui";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { checksSchema } from "~/lib/round-forms";
import { roundDesign, saveChecks, scoreRound } from "~/models/round.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRound } from "~/server/round-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { writeRefusal } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Homogeneity & stability" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRound(context, ["coordinator", "admin"]);
  const [{ groups }, scored] = await Promise.all([roundDesign(study.id), scoreRound(study)]);
  return {
    editable: access === "coordinator" && writeRefusal("roundChecks", study.state) === null,
    refusal: writeRefusal("roundChecks", study.state),
    groups: groups.map((group, index) => ({ ...group, scored: scored[index]! })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRound(context, ["coordinator"]);
  return submitForm(request, checksSchema, (value) => saveChecks(study, user.id, value), () => redirectWithToast(`/rounds/${study.id}/material-checks`, "Check results saved."));
}

type Group = Route.ComponentProps["loaderData"]["groups"][number];

function PassBadge({ passes }: { passes: boolean }) {
  return <Badge tone={passes ? "leaf" : "signal"}>{passes ? "Meets the criterion" : "Fails the criterion"}</Badge>;
}

function ChecksForm({ group, editable, reply }: { group: Group; editable: boolean; reply: unknown }) {
  const { material, response, scored } = group;
  const [form, fields] = useSchemaForm(checksSchema, {
    reply: replyFor(reply, material.id, response.id),
    id: `checks-${material.id}-${response.id}`,
    defaultValue: {
      homogeneity: group.homogeneity.map((pair) => pair.join(" ")).join("\n"),
      stability: group.stability.join("\n"),
      justification: scored.justification,
    },
  });
  const d = figureDecimals(response.decimals);
  const { homogeneity, stability } = scored;
  return (
    <Card title={`${material.code} · ${response.name}`}>
      <div className="mb-4 grid gap-4 md:grid-cols-2">
        <div>
          <h3 className="font-semibold">Homogeneity (ISO 13528 B.3)</h3>
          {homogeneity ? (
            <p>
              {homogeneity.samples} samples: s_x = {formatFigure(homogeneity.sx, d.sd)}, s_w = {formatFigure(homogeneity.sw, d.sd)}, between-sample s_s ={" "}
              <strong>{formatFigure(homogeneity.ss, d.sd)}</strong> against 0.3·σ_pt = {formatFigure(homogeneity.criterion, d.sd)}{" "}
              <PassBadge passes={homogeneity.passes} />
            </p>
          ) : (
            <p className="text-basalt-700">{scored.scores ? "No homogeneity results yet." : "Shown once σ_pt can be computed."}</p>
          )}
        </div>
        <div>
          <h3 className="font-semibold">Stability (ISO 13528 B.5)</h3>
          {stability ? (
            <p>
              |ȳ₁ − ȳ₂| = <strong>{formatFigure(stability.difference, d.sd)}</strong> against 0.3·σ_pt = {formatFigure(stability.criterion, d.sd)}{" "}
              <PassBadge passes={stability.passes} />
            </p>
          ) : (
            <p className="text-basalt-700">Needs the homogeneity results and at least one result after testing.</p>
          )}
        </div>
      </div>
      {!scored.checksCleared && (
        <Notice tone="caution">Scores cannot be published until both checks meet their criteria or a justification is recorded below.</Notice>
      )}
      {editable && (
        <PostForm form={form} submitLabel="Save check results" hidden={groupFields("checks", group)} className="mt-4 grid gap-3 md:grid-cols-2" errorsClassName="md:col-span-2">
          <TextAreaField
            label="Homogeneity: two results per sample"
            rows={8}
            hint="One sample per line, its two results separated by a space, such as “14 15”. ISO 13528 asks for 10 or more samples, drawn at random before shipping."
            {...fieldProps(fields.homogeneity)}
          />
          <TextAreaField
            label="Stability: results after the testing period"
            rows={8}
            hint="One result per line, from samples kept back and tested after the labs' testing period."
            {...fieldProps(fields.stability)}
          />
          <div className="md:col-span-2">
            <TextAreaField
              label="Justification for publishing without passing checks"
              rows={3}
              hint="Only if a check fails or could not be done: say why the scores are still fit to publish (it appears in the report and letters)."
              {...fieldProps(fields.justification)}
            />
          </div>
        </PostForm>
      )}
    </Card>
  );
}

export default function MaterialChecks({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="flex flex-col gap-6">
      <p className="text-basalt-700">
        Before shipping, test g samples of each material twice; after the testing period, test samples kept back. The page compares the between-sample
        standard deviation and the stability difference with 0.3·σ_pt.
      </p>
      <ConcreteCaution heavy />
      {loaderData.refusal && <Notice>{loaderData.refusal}</Notice>}
      {loaderData.groups.map((group) => (
        <ChecksForm key={`${group.material.id}-${group.response.id}`} group={group} editable={loaderData.editable} reply={actionData} />
      ))}
    </div>
  );
}
