/**
 * The analysis charts of every response, each a figure with a caption and its
 * data as a table for screen readers and print. The chart drawing itself is
 * loaded lazily, in the browser only, after hydration.
 */
import { lazy, type ReactNode, Suspense, useState } from "react";
import { useHydrated } from "~/components/use-hydrated";
import type { ResponseInfo } from "~/components/precision-tables";
import { SimpleTable } from "~/components/ui";
import type { StudyAnalysis } from "~/lib/precision";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { cellAveragesOption, type ChartOption, consistencyOption, labPoints, levelOption } from "./options";

const EChart = lazy(() => import("./e-chart"));

/**
 * A chart with its data as a table under a disclosure. With `tableOnOpen` the
 * table is built only when someone opens it: a page of many charts then
 * sends their numbers once, as data, not also as markup (pages meant for
 * printing keep the table in the page).
 */
export function ChartFigure({
  title,
  summary,
  option,
  children,
  tableOnOpen = false,
}: {
  title: string;
  summary: string;
  option: ChartOption;
  children: ReactNode;
  tableOnOpen?: boolean;
}) {
  const hydrated = useHydrated();
  const [open, setOpen] = useState(false);
  return (
    <figure className="flex flex-col gap-2 break-inside-avoid">
      <figcaption className="font-semibold text-basalt-800">{title}</figcaption>
      <p className="text-sm text-basalt-700">{summary}</p>
      {hydrated ? (
        <Suspense fallback={<p className="h-80">Drawing the chart…</p>}>
          <EChart option={option} label={`${title}. ${summary}`} />
        </Suspense>
      ) : (
        <p className="h-80 text-basalt-700">The chart is drawn once the page has loaded; its data are in the table below.</p>
      )}
      <details onToggle={(event) => setOpen(event.currentTarget.open)}>
        <summary className="cursor-pointer font-semibold text-basalt-700">Chart data as a table</summary>
        {!tableOnOpen || open ? children : null}
      </details>
    </figure>
  );
}

function flaggedSummary(analysis: StudyAnalysis, response: string, statistic: "h" | "k") {
  const flagged = labPoints(analysis, response).filter((p) => p.lab.flags.includes(statistic));
  return flagged.length === 0
    ? `No lab is beyond the critical ${statistic} value.`
    : `Beyond the critical ${statistic} value: ${flagged.map((p) => `lab ${p.lab.lab} on ${p.material}`).join(", ")}.`;
}

export function LazyCharts({ analysis, responses, tableOnOpen = false }: { analysis: StudyAnalysis; responses: ResponseInfo[]; tableOnOpen?: boolean }) {
  return (
    <div className="flex flex-col gap-8">
      {responses.map((response) => {
        const points = labPoints(analysis, response.key);
        const d = figureDecimals(response.decimals);
        const level = levelOption(analysis, response.key);
        const fit = analysis.levelFits.find((f) => f.response === response.key);
        return (
          <section key={response.key} aria-label={`Charts of ${response.name}`} className="grid gap-6 lg:grid-cols-2">
            {(["h", "k"] as const).map((statistic) => (
              <ChartFigure
                key={statistic}
                tableOnOpen={tableOnOpen}
                title={`${statistic} plot — ${response.name}`}
                summary={flaggedSummary(analysis, response.key, statistic)}
                option={consistencyOption(analysis, response.key, statistic)}
              >
                <SimpleTable
                  caption={`${statistic} by lab and material, ${response.name}`}
                  headers={["Material", "Lab", statistic, "Critical", "Flag"]}
                  rows={points.map((p) => [
                    p.material,
                    p.lab.lab,
                    formatFigure(p.lab[statistic], 2),
                    p.group.status === "computed" ? (statistic === "h" ? `±${p.group.hCritical.toFixed(2)}` : p.group.kCritical.toFixed(2)) : "—",
                    p.lab.flags.includes(statistic) ? "flagged" : "",
                  ])}
                />
              </ChartFigure>
            ))}
            <ChartFigure
              tableOnOpen={tableOnOpen}
              title={`Cell averages ± s — ${response.name}`}
              summary="Each lab's cell average with one cell standard deviation either side; the dashed segment is the material's average of cell averages."
              option={cellAveragesOption(analysis, response.key, response.unit)}
            >
              <SimpleTable
                caption={`Cell averages and standard deviations, ${response.name}`}
                headers={["Material", "Lab", "Cell average", "s"]}
                rows={points.map((p) => [p.material, p.lab.lab, formatFigure(p.lab.mean, d.mean), formatFigure(p.lab.sd, d.sd)])}
              />
            </ChartFigure>
            {level && fit && (
              <ChartFigure
                tableOnOpen={tableOnOpen}
                title={`s_r and s_R against level — ${response.name}`}
                summary={
                  `Weighted fit (ISO 5725-2): s_r ${fit.sr.candidates.find((c) => c.relation === fit.sr.chosen)?.formula ?? "none"}, ` +
                  `s_R ${fit.sR.candidates.find((c) => c.relation === fit.sR.chosen)?.formula ?? "none"}${fit.sr.notes.length ? ` (${fit.sr.notes.join("; ")})` : ""}. ` +
                  (fit.c670Form ? `Statement form for both: ${fit.c670Form.form === "percent" ? "1s % and d2s %" : "1s and d2s"}.` : "")
                }
                option={level}
              >
                <SimpleTable
                  caption={`s_r and s_R by material level, ${response.name}`}
                  headers={["Material", "Level x̿", "s_r", "s_R"]}
                  rows={fit.sr.points.map((p, i) => [p.material, formatFigure(p.level, d.mean), formatFigure(p.s, d.sd), formatFigure(fit.sR.points[i]?.s, d.sd)])}
                />
              </ChartFigure>
            )}
          </section>
        );
      })}
    </div>
  );
}
