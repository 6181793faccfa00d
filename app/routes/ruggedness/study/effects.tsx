import { Link } from "react-router";
import type { Route } from "./+types/effects";
import { HalfNormalFigure } from "~/components/charts/half-normal";
import { NoDesignYet } from "~/components/no-design-yet";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Notice, SimpleTable } from "~/components/ui";
import { ruggednessAnalysis } from "~/models/ruggedness.server";
import { requireRuggednessStudy } from "~/server/ruggedness-context.server";
import { studyPageMeta } from "~/lib/study-page-meta";
import { formatFixed, formatSigned } from "~/lib/format";

export const handle = { pageTitle: "Effects" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  const { setup, responses } = await ruggednessAnalysis(study.id);
  return { studyId: study.id, planned: setup.plan !== null, responses };
}


export default function EffectsPage({ loaderData }: Route.ComponentProps) {
  const { studyId, planned, responses } = loaderData;
  if (!planned) {
    return <NoDesignYet studyId={studyId} />;
  }
  return (
    <div className="flex flex-col gap-6">
      {responses.map(({ response, analysis }) => (
        <Card key={response.key} title={response.name}>
          {analysis.status === "incomplete" ? (
            <p>
              Runs without results yet: {analysis.missingRuns.join(", ")}. <Link to={`/ruggedness/${studyId}/results`} className="font-semibold underline">Enter them</Link>.
            </p>
          ) : (
            <div className="flex flex-col gap-4">
              <p className="text-basalt-700">
                Effect = average of the runs at the high setting − average at the low setting (ASTM E1169).{" "}
                {analysis.scatter
                  ? analysis.scatter.basis === "replicates"
                    ? `Tested against the scatter of the repeated results: standard error of an effect ${analysis.scatter.standardError.toFixed(3)} ${response.unit}, ${analysis.scatter.degreesOfFreedom} degrees of freedom, two-sided t test at 5 %.`
                    : `Tested against the dummy columns' effects: standard error of an effect ${analysis.scatter.standardError.toFixed(3)} ${response.unit}, ${analysis.scatter.degreesOfFreedom} degrees of freedom, two-sided t test at 5 %.`
                  : "With one result per run and no dummy column the effects cannot be tested; read them on the half-normal plot."}
              </p>
              {analysis.scatter?.basis === "dummy-columns" && analysis.scatter.degreesOfFreedom < 3 && (
                <Notice tone="caution">Only {analysis.scatter.degreesOfFreedom} dummy {analysis.scatter.degreesOfFreedom === 1 ? "column" : "columns"}: the test is weak. Two results per run give a firmer one.</Notice>
              )}
              <SimpleTable
                caption={`Effects on ${response.name}`}
                headers={["Column", "Factor", `Effect (${response.unit || "units"})`, "t", "Critical t", "Significant"]}
                rows={analysis.columns.map((c) => [
                  c.column,
                  c.label,
                  formatSigned(c.effect, 2),
                  c.test?.t == null ? "—" : formatFixed(c.test.t, 2),
                  c.test ? c.test.critical.toFixed(2) : "—",
                  c.test ? (c.test.significant ? <strong key="yes" className="text-signal-700">yes</strong> : "no") : "—",
                ])}
              />
              <HalfNormalFigure
                title={`Half-normal plot of the effects on ${response.name}`}
                points={analysis.halfNormal}
                significant={new Set(analysis.columns.filter((c) => c.test?.significant).map((c) => c.label))}
                unit={response.unit}
              />
            </div>
          )}
        </Card>
      ))}
    </div>
  );
}
