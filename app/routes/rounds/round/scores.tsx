import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/scores";
import { FormErrors, useSchemaForm } from "~/components/forms";
import { formatScore, VerdictBadge } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice, SimpleTable } from "~/components/ui";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { publishRoundSchema } from "~/lib/round-forms";
import { publicationProblems, publishedRound, publishRound, scoreRound } from "~/models/round.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireRound } from "~/server/round-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Scores" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRound(context, ["coordinator", "admin"]);
  const published = await publishedRound(study.id);
  const groups = published?.groups ?? (await scoreRound(study));
  return {
    published: published !== null,
    groups,
    problems: published ? [] : publicationProblems(study, groups),
    canPublish: access === "coordinator" && !published,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRound(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: publishRoundSchema });
  if (submission.status !== "success") return refuse(submission);
  const published = await withRefusals(submission, () => publishRound(study, user.id, { request }));
  if (!published.ok) return published.reply;
  return redirectWithToast(`/rounds/${study.id}/report`, "Round published: every lab can now read its letter.");
}

export default function Scores({ loaderData, actionData }: Route.ComponentProps) {
  const { groups, problems, canPublish, published } = loaderData;
  const [form] = useSchemaForm(publishRoundSchema, { reply: actionData, intent: "publish" });
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-6">
      <p className="text-basalt-700">
        z = (x − x_pt)/σ_pt; z′ when u(x_pt) exceeds 0.3·σ_pt; ζ where a lab gave its own uncertainty. |score| ≤ 2 satisfactory, 2 &lt; |score| &lt; 3
        questionable, ≥ 3 unsatisfactory (ISO 13528 clause 9). {published ? "These are the published scores; they no longer change." : "Scores follow the current results and choices until the round is published."}
      </p>
      {groups.map((group) => {
        const d = figureDecimals(group.response.decimals);
        return (
          <Card key={`${group.material.code}-${group.response.key}`} title={`${group.material.code} · ${group.response.name}`}>
            {group.scores ? (
              <>
                <p className="mb-3">
                  x_pt = {formatFigure(group.scores.assignedValue, d.mean)}, u(x_pt) = {formatFigure(group.scores.assignedUncertainty, d.sd)}, σ_pt ={" "}
                  {formatFigure(group.scores.sigmaPt, d.sd)}
                </p>
                <SimpleTable
                  caption={`Scores on ${group.material.code}, ${group.response.name}`}
                  headers={["Lab code", "Result", "z", "z′", "ζ", "Verdict"]}
                  rows={group.scores.labs.map((lab) => [
                    lab.labCode,
                    formatFigure(lab.result, d.mean),
                    formatScore(lab.z),
                    formatScore(lab.zPrime),
                    formatScore(lab.zeta),
                    <VerdictBadge key="v" verdict={lab.verdict} />,
                  ])}
                />
              </>
            ) : (
              <Notice tone="caution">{group.refusal}</Notice>
            )}
          </Card>
        );
      })}
      {canPublish && (
        <Card title="Publish the round">
          {problems.length > 0 ? (
            <Notice tone="caution">
              <ul className="ml-5 list-disc">
                {problems.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            </Notice>
          ) : (
            <Form method="post" className="flex flex-col gap-3" {...getFormProps(form)}>
              <input type="hidden" name="intent" value="publish" />
              <FormErrors errors={form.errors} />
              <label className="flex items-start gap-2">
                <input type="checkbox" name="confirm" value="yes" className="mt-1" />
                <span>The scores are final: publish the round report and open every lab's letter. Published scores never change.</span>
              </label>
              {form.allErrors.confirm && <p className="text-sm font-semibold text-signal-700">{form.allErrors.confirm[0]}</p>}
              <div>
                <Button type="submit" disabled={busy}>
                  Publish round
                </Button>
              </div>
            </Form>
          )}
        </Card>
      )}
    </div>
  );
}
