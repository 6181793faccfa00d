/** Half-normal plot of a ruggedness study's effects: |effect| against half-normal quantiles, factors that matter stand off the line. */
import { SimpleTable } from "~/components/ui";
import type { HalfNormalPoint } from "~/lib/ruggedness";
import { ChartFigure } from "./lazy-charts";
import type { ChartOption } from "./options";
import { CHART_COLOURS } from "./palette";

export function halfNormalOption(points: readonly HalfNormalPoint[], significant: ReadonlySet<string>, unit: string): ChartOption {
  const axis = { axisLabel: { color: CHART_COLOURS.ink }, splitLine: { lineStyle: { color: CHART_COLOURS.grid } } };
  return {
    grid: { left: 56, right: 24, top: 24, bottom: 48 },
    tooltip: { trigger: "item" },
    xAxis: { type: "value", name: "half-normal quantile", nameLocation: "middle", nameGap: 28, min: 0, ...axis },
    yAxis: { type: "value", name: `|effect| (${unit})`, min: 0, ...axis },
    series: [
      {
        type: "scatter",
        symbolSize: 12,
        data: points.map((p, i) => ({
          value: [p.quantile, p.absoluteEffect],
          name: p.label,
          itemStyle: { color: significant.has(p.label) ? CHART_COLOURS.flagged : CHART_COLOURS.bar },
          // the largest effects sit at the right edge: their names go to the left of the point
          label: { position: i >= points.length / 2 ? "left" : "right" },
        })),
        label: { show: true, position: "right", formatter: "{b}", color: CHART_COLOURS.ink, fontSize: 11 },
      },
    ],
  };
}

export function HalfNormalFigure({ title, points, significant, unit }: { title: string; points: readonly HalfNormalPoint[]; significant: ReadonlySet<string>; unit: string }) {
  const standingOff = points.filter((p) => significant.has(p.label)).map((p) => p.label);
  const summary = standingOff.length
    ? `Significant: ${standingOff.join(", ")} (shown in red). The others lie near a line through the origin, as effects of chance do.`
    : "No effect stands off the line through the origin that effects of chance follow.";
  return (
    <ChartFigure title={title} summary={summary} option={halfNormalOption(points, significant, unit)}>
      <SimpleTable
        caption={title}
        headers={["Column", "|effect|", "Half-normal quantile"]}
        rows={points.map((p) => [p.label, p.absoluteEffect.toFixed(3), p.quantile.toFixed(3)])}
      />
    </ChartFigure>
  );
}
