import type { Route } from "./+types/letter";
import { ChartFigure } from "~/components/charts/lazy-charts";
import { histogramOption, historyOption, resultBins } from "~/components/charts/round-options";
import { formatScore, VerdictBadge } from "~/components/round-parts";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { VERDICT_ADVICE } from "~/lib/proficiency";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { labLetter } from "~/models/round.server";
import { requireRound } from "~/server/round-context.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Letter" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireRound(context, ["analyst"]);
  return { letter: await labLetter(study.id, enrollment!) };
}

type Letter = NonNullable<Route.ComponentProps["loaderData"]["letter"]>;

function GroupSection({ group, labCode }: { group: Letter["groups"][number]; labCode: string }) {
  const d = figureDecimals(group.response.decimals);
  const unit = group.response.unit ? ` ${group.response.unit}` : "";
  const own = group.own;
  return (
    <Card title={`${group.material.code} · ${group.response.name}`} className="break-inside-avoid">
      {own ? (
        <div className="mb-4 flex flex-wrap items-center gap-3 text-lg">
          <span>
            Your result <strong>{formatFigure(own.result, d.mean)}</strong>
            {unit}
          </span>
          <span>
            {own.scoreKind} = <strong>{formatScore(own.score)}</strong>
          </span>
          {own.zeta !== null && <span>ζ = {formatScore(own.zeta)}</span>}
          <VerdictBadge verdict={own.verdict} />
        </div>
      ) : (
        <p className="mb-4">Your lab has no scored result on this material and response.</p>
      )}
      {group.assignedValue !== null && group.sigmaPt !== null ? (
        <>
          <dl className="mb-4 grid gap-1 sm:grid-cols-[12rem_1fr]">
            <dt className="font-semibold">Assigned value x_pt</dt>
            <dd>
              {formatFigure(group.assignedValue, d.mean)}
              {unit}, standard uncertainty {formatFigure(group.assignedUncertainty, d.sd)}. {group.assignedBasis}
            </dd>
            <dt className="font-semibold">σ_pt</dt>
            <dd>
              {formatFigure(group.sigmaPt, d.sd)}
              {unit}. {group.sigmaBasis}
            </dd>
            <dt className="font-semibold">Labs scored</dt>
            <dd>{group.labsScored}</dd>
          </dl>
          <ChartFigure
            title={`Results of all labs, ${group.material.code} · ${group.response.name}`}
            summary={`Each bar counts the labs whose result falls in a band of σ_pt/2; your lab's band is highlighted, the assigned value and ±2σ_pt, ±3σ_pt are marked.`}
            option={histogramOption(resultBins(group.distribution, group.assignedValue, group.sigmaPt, labCode), group.assignedValue, group.sigmaPt, group.response.unit, d.mean)}
          >
            <SimpleTable
              caption="Results by lab code"
              headers={["Lab code", "Result"]}
              rows={group.distribution.map((r) => [r.labCode === labCode ? `${r.labCode} (your lab)` : r.labCode, formatFigure(r.result, d.mean)])}
            />
          </ChartFigure>
        </>
      ) : (
        <Notice tone="caution">This material and response was not scored: {group.refusal}</Notice>
      )}
      {own && own.verdict !== "satisfactory" && (
        <Notice tone={own.verdict === "unsatisfactory" ? "error" : "caution"}>
          <p className="font-semibold">What to do now</p>
          <p>{VERDICT_ADVICE[own.verdict]}</p>
        </Notice>
      )}
    </Card>
  );
}

export default function LabRoundLetter({ loaderData }: Route.ComponentProps) {
  const { letter } = loaderData;
  if (!letter) {
    return <Notice>Your letter appears here once the coordinator publishes the round's scores.</Notice>;
  }
  const { report, labCode, groups, history } = letter;
  return (
    <article className="flex flex-col gap-6">
      <header className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <p className="font-semibold uppercase tracking-wide text-signal-700">Confidential — for lab {labCode} only</p>
          <p>
            Round {report.code}, {report.testMethod}, published {formatDate(report.publishedAt)}. {report.replicates} replicate
            {report.replicates === 1 ? "" : "s"} per material; your result is their average.
          </p>
          <p className="text-sm text-basalt-700">
            Scores follow ISO 13528: z = (x − x_pt)/σ_pt, z′ where the assigned value's uncertainty is not negligible, ζ where you gave your own
            uncertainty. |score| ≤ 2 satisfactory; 2 &lt; |score| &lt; 3 questionable (a warning signal); ≥ 3 unsatisfactory (an action signal).
          </p>
        </div>
        <Button type="button" variant="secondary" className="no-print" onClick={() => window.print()}>
          Print letter
        </Button>
      </header>
      {groups.map((group) => (
        <GroupSection key={`${group.material.code}-${group.response.key}`} group={group} labCode={labCode} />
      ))}
      <Card title="Your lab across rounds" className="break-inside-avoid">
        <ChartFigure
          title="Your scores round after round"
          summary="One line per material and response, with the ±2 (warning) and ±3 (action) limits."
          option={historyOption(history.map((h) => ({ round: h.round, material: h.material, response: h.response, score: h.score, scoreKind: h.scoreKind })))}
        >
          <SimpleTable
            caption="Your scores by round"
            headers={["Round", "Published", "Material", "Response", "Score", "Verdict"]}
            rows={history.map((h) => [h.round, formatDate(h.publishedAt), h.material, h.response, `${h.scoreKind} ${formatScore(h.score)}`, <VerdictBadge key="v" verdict={h.verdict} />])}
          />
        </ChartFigure>
      </Card>
      <p className="text-sm text-basalt-700">
        Proficiency scores support your lab's quality system and its accreditation body's assessment; they do not replace them. Local codes,
        specifications and licensed engineers govern the acceptance of concrete.
      </p>
    </article>
  );
}
