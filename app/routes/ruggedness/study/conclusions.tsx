import { Link } from "react-router";
import type { Route } from "./+types/conclusions";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Notice } from "~/components/ui";
import { ruggednessAnalysis } from "~/models/ruggedness.server";
import { requireRuggednessStudy } from "~/server/ruggedness-context.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Conclusions" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  const { setup, responses } = await ruggednessAnalysis(study.id);
  return { studyId: study.id, factors: setup.factors, responses };
}

export default function ConclusionsPage({ loaderData }: Route.ComponentProps) {
  const { studyId, factors, responses } = loaderData;
  const computed = responses.flatMap((r) => (r.analysis.status === "computed" ? [{ response: r.response, analysis: r.analysis }] : []));
  if (computed.length === 0) {
    return (
      <Card>
        <p>
          Conclusions follow once every run has its results. <Link to={`/ruggedness/${studyId}/results`} className="font-semibold underline">Enter the results</Link>.
        </p>
      </Card>
    );
  }
  const matters = factors.filter((f) => computed.some(({ analysis }) => analysis.columns.find((c) => c.column === f.column)?.test?.significant));
  return (
    <div className="flex flex-col gap-6">
      <Card title="In short">
        {matters.length === 0 ? (
          <p data-testid="ruggedness-summary">No factor changed the results beyond the test's own scatter: the method is rugged over the tested ranges.</p>
        ) : (
          <p data-testid="ruggedness-summary">
            {matters.map((f) => f.name).join(", ")} {matters.length === 1 ? "matters" : "matter"}: the method must specify{" "}
            {matters.length === 1 ? "it" : "them"} more tightly before the interlaboratory study. The other factors may vary within their tested ranges.
          </p>
        )}
      </Card>
      {computed.map(({ response, analysis }) => (
        <Card key={response.key} title={response.name}>
          <ul className="flex list-disc flex-col gap-2 pl-6">
            {analysis.columns
              .filter((c) => c.conclusion)
              .map((c) => (
                <li key={c.column} className={c.test?.significant ? "font-semibold text-signal-700" : undefined}>
                  {c.conclusion}
                </li>
              ))}
          </ul>
        </Card>
      ))}
      <Notice tone="caution">
        A ruggedness test screens main effects and assumes interactions are small (ASTM E1169); a factor found to matter deserves a closer
        study before the method's tolerance is written. Local codes, specifications and licensed engineers govern.
      </Notice>
    </div>
  );
}
