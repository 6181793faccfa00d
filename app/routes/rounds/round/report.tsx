import type { Route } from "./+types/report";
import { formatScore, VerdictBadge } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Notice, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { methodPerformance, roundReport } from "~/models/round.server";
import { requireRound } from "~/server/round-context.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Round report" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRound(context, ["coordinator", "admin"]);
  const [report, performance] = await Promise.all([roundReport(study), methodPerformance(study.testMethod)]);
  return { ...report, performance, testMethod: study.testMethod };
}

export default function RoundReport({ loaderData }: Route.ComponentProps) {
  const { groups, labNames, published, performance, testMethod } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      {!published && <Notice tone="caution">Draft: the round is not published, and these figures follow the current results and choices.</Notice>}
      <p className="text-basalt-700">Lab names appear in this report for the coordinator only; each lab's letter shows other labs by code.</p>
      {groups.map((group) => {
        const d = figureDecimals(group.response.decimals);
        return (
          <Card key={`${group.material.code}-${group.response.key}`} title={`${group.material.code} · ${group.response.name}`} className="break-inside-avoid">
            {group.scores ? (
              <>
                <dl className="mb-3 grid gap-1 sm:grid-cols-[12rem_1fr]">
                  <dt className="font-semibold">Assigned value</dt>
                  <dd>
                    {formatFigure(group.scores.assignedValue, d.mean)} (u = {formatFigure(group.scores.assignedUncertainty, d.sd)}). {group.assignedBasis}
                  </dd>
                  <dt className="font-semibold">σ_pt</dt>
                  <dd>
                    {formatFigure(group.scores.sigmaPt, d.sd)}. {group.sigmaBasis}
                  </dd>
                  <dt className="font-semibold">Material checks</dt>
                  <dd>
                    {group.homogeneity ? `s_s = ${formatFigure(group.homogeneity.ss, d.sd)} (limit ${formatFigure(group.homogeneity.criterion, d.sd)})` : "no homogeneity results"};{" "}
                    {group.stability ? `stability difference ${formatFigure(group.stability.difference, d.sd)} (limit ${formatFigure(group.stability.criterion, d.sd)})` : "no stability results"}
                    {group.justification && `. Justification: ${group.justification}`}
                  </dd>
                </dl>
                <SimpleTable
                  caption={`Every lab's score on ${group.material.code}, ${group.response.name}`}
                  headers={["Lab code", "Lab", "Result", "Score", "ζ", "Verdict"]}
                  rows={group.scores.labs.map((lab) => [
                    lab.labCode,
                    labNames[lab.labCode] ?? "—",
                    formatFigure(lab.result, d.mean),
                    `${lab.scoreKind} ${formatScore(lab.score)}`,
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
      <Card title={`The method round over round: ${testMethod}`}>
        {performance.length === 0 ? (
          <p>No published round of this test method yet.</p>
        ) : (
          <SimpleTable
            caption="Published rounds of the test method"
            headers={["Round", "Published", "Material", "Response", "Labs", "x_pt", "σ_pt", "Robust s*", "Satisfactory"]}
            rows={performance.map((p) => [
              p.round,
              formatDate(p.publishedAt),
              p.material,
              p.response,
              String(p.labs),
              formatFigure(p.assignedValue, 2),
              formatFigure(p.sigmaPt, 2),
              formatFigure(p.robustSd, 2),
              `${Math.round(p.satisfactoryShare * 100)} %`,
            ])}
          />
        )}
      </Card>
    </div>
  );
}
