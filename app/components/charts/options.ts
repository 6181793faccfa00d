/**
 * Chart options built from an analysis, kept free of the charting library so
 * pages can build the text alternatives without loading it.
 */
import type { GroupResult, LabResult, LevelFitReport, StudyAnalysis } from "~/lib/precision";
import { predictLevelModel } from "~/lib/precision/level-fit";
import { CHART_COLOURS } from "./palette";

export type ChartOption = Record<string, unknown>;

export type LabPoint = { key: string; material: string; lab: LabResult; group: GroupResult };

/** Labs in material order: the x axis of the per-lab charts, bars grouped by material. */
export function labPoints(analysis: StudyAnalysis, response: string): LabPoint[] {
  return analysis.groups
    .filter((g) => g.response === response)
    .flatMap((group) => group.labs.map((lab) => ({ key: `${group.material} ${lab.lab}`, material: group.material, lab, group })));
}

function materialSpans(points: LabPoint[]) {
  const spans: { material: string; first: string; last: string; group: GroupResult }[] = [];
  for (const p of points) {
    const span = spans.at(-1);
    if (span && span.material === p.material) span.last = p.key;
    else spans.push({ material: p.material, first: p.key, last: p.key, group: p.group });
  }
  return spans;
}

function perLabAxes(points: LabPoint[], yName: string) {
  return {
    grid: { left: 56, right: 16, top: 40, bottom: 56 },
    tooltip: { trigger: "item" },
    xAxis: {
      type: "category",
      data: points.map((p) => p.key),
      axisLabel: { formatter: (value: string) => value.split(" ")[1], rotate: 90, color: CHART_COLOURS.ink },
      axisTick: { alignWithLabel: true },
    },
    yAxis: { type: "value", name: yName, nameTextStyle: { color: CHART_COLOURS.ink }, axisLabel: { color: CHART_COLOURS.ink }, splitLine: { lineStyle: { color: CHART_COLOURS.grid } } },
  };
}

/** Alternate faint bands name each material above its group of bars. */
function materialBands(points: LabPoint[]) {
  return {
    silent: true,
    itemStyle: { color: CHART_COLOURS.band },
    label: { color: CHART_COLOURS.ink, fontWeight: "bold", position: "insideTop" },
    data: materialSpans(points).map((s, i) => [
      { name: s.material, xAxis: s.first, itemStyle: { color: i % 2 === 0 ? CHART_COLOURS.band : "transparent" } },
      { xAxis: s.last },
    ]),
  };
}

/** Horizontal segments over each material's bars, e.g. its critical values. */
function segments(points: LabPoint[], valueOf: (g: GroupResult) => number[], name: string) {
  return {
    silent: true,
    symbol: "none",
    lineStyle: { color: CHART_COLOURS.critical, type: "dashed", width: 2 },
    label: { show: false },
    data: materialSpans(points).flatMap((s) =>
      valueOf(s.group).map((y) => [
        { name, coord: [s.first, y] },
        { coord: [s.last, y] },
      ]),
    ),
  };
}

/** E691 h or k plot: one bar per lab, grouped by material, flagged bars in the alert colour and marked ⚑, critical values dashed. */
export function consistencyOption(analysis: StudyAnalysis, response: string, statistic: "h" | "k"): ChartOption {
  const points = labPoints(analysis, response);
  const critical = (g: GroupResult) =>
    g.status !== "computed" ? [] : statistic === "h" ? [g.hCritical, -g.hCritical] : [g.kCritical];
  // The axis always reaches past the critical values, so their lines are drawn even when no bar comes near them.
  const reach = Math.max(...points.map((p) => Math.abs(p.lab[statistic] ?? 0)), ...points.flatMap((p) => critical(p.group).map(Math.abs)), 1);
  const bound = Math.ceil(reach * 1.1 * 2) / 2;
  const axes = perLabAxes(points, statistic);
  return {
    ...axes,
    yAxis: { ...axes.yAxis, min: statistic === "h" ? -bound : 0, max: bound },
    series: [
      {
        type: "bar",
        name: statistic,
        data: points.map((p) => {
          const flagged = p.lab.flags.includes(statistic);
          return {
            value: p.lab[statistic],
            itemStyle: { color: flagged ? CHART_COLOURS.flagged : CHART_COLOURS.bar },
            label: { show: flagged, formatter: "⚑", position: (p.lab[statistic] ?? 0) < 0 ? "bottom" : "top", color: CHART_COLOURS.flagged, fontSize: 14 },
          };
        }),
        markArea: materialBands(points),
        markLine: segments(points, critical, `critical ${statistic}`),
      },
    ],
  };
}

/** Cell averages with ±s whiskers per lab, grouped by material, the material's x̿ as a segment. */
export function cellAveragesOption(analysis: StudyAnalysis, response: string, unit: string): ChartOption {
  const points = labPoints(analysis, response);
  return {
    ...perLabAxes(points, unit || "average"),
    series: [
      {
        type: "custom",
        name: "± s",
        renderItem: (_params: unknown, api: { value: (i: number) => number; coord: (p: number[]) => number[] }) => {
          const low = api.coord([api.value(0), api.value(1)]);
          const high = api.coord([api.value(0), api.value(2)]);
          return {
            type: "group",
            children: [
              { type: "line", shape: { x1: low[0], y1: low[1], x2: high[0], y2: high[1] }, style: { stroke: CHART_COLOURS.ink, lineWidth: 1.5 } },
              { type: "line", shape: { x1: low[0]! - 4, y1: low[1], x2: low[0]! + 4, y2: low[1] }, style: { stroke: CHART_COLOURS.ink, lineWidth: 1.5 } },
              { type: "line", shape: { x1: high[0]! - 4, y1: high[1], x2: high[0]! + 4, y2: high[1] }, style: { stroke: CHART_COLOURS.ink, lineWidth: 1.5 } },
            ],
          };
        },
        data: points.map((p, i) => [i, p.lab.mean - (p.lab.sd ?? 0), p.lab.mean + (p.lab.sd ?? 0)]),
        z: 1,
      },
      {
        type: "scatter",
        name: "cell average",
        symbolSize: 9,
        data: points.map((p) => ({ value: p.lab.mean, itemStyle: { color: p.lab.flags.length ? CHART_COLOURS.flagged : CHART_COLOURS.bar } })),
        markArea: materialBands(points),
        markLine: segments(points, (g) => (g.status === "computed" ? [g.mean] : []), "x̿"),
        z: 2,
      },
    ],
  };
}

function fittedLine(report: LevelFitReport) {
  const chosen = report.candidates.find((c) => c.relation === report.chosen);
  if (!chosen || report.points.length === 0) return [];
  const levels = report.points.map((p) => p.level);
  const [lo, hi] = [Math.min(...levels), Math.max(...levels)];
  return Array.from({ length: 21 }, (_, i) => {
    const m = lo + ((hi - lo) * i) / 20;
    return [m, predictLevelModel(chosen, m)];
  });
}

/** s_r and s_R of each material against its level, with the relation the engine chose drawn through them. */
export function levelOption(analysis: StudyAnalysis, response: string): ChartOption | null {
  const fit = analysis.levelFits.find((f) => f.response === response);
  if (!fit || fit.sr.points.length === 0) return null;
  const series = ([
    ["s_r", fit.sr, CHART_COLOURS.repeatability, "circle"],
    ["s_R", fit.sR, CHART_COLOURS.reproducibility, "diamond"],
  ] as const).flatMap(([name, report, color, symbol]) => [
    { type: "scatter", name, symbol, symbolSize: 11, itemStyle: { color }, data: report.points.map((p) => [p.level, p.s]) },
    { type: "line", name: `${name} fitted`, showSymbol: false, lineStyle: { color, type: "dashed" }, itemStyle: { color }, data: fittedLine(report) },
  ]);
  return {
    grid: { left: 56, right: 16, top: 48, bottom: 40 },
    tooltip: { trigger: "item" },
    legend: { top: 0, textStyle: { color: CHART_COLOURS.ink } },
    xAxis: { type: "value", name: "level x̿", scale: true, axisLabel: { color: CHART_COLOURS.ink }, splitLine: { lineStyle: { color: CHART_COLOURS.grid } } },
    yAxis: { type: "value", name: "s", min: 0, axisLabel: { color: CHART_COLOURS.ink }, splitLine: { lineStyle: { color: CHART_COLOURS.grid } } },
    series,
  };
}
