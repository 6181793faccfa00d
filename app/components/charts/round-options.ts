/** Chart options of a lab's letter: the round's results as a histogram, and the lab's scores over time. */
import type { ChartOption } from "./options";
import { CHART_COLOURS } from "./palette";

export type HistogramBin = { from: number; to: number; labCodes: string[]; own: boolean };

/**
 * Bins of width σ_pt/2 laid so that x_pt sits in the middle of a bin; each
 * bin lists the lab codes in it, and marks the reader's own.
 */
export function resultBins(distribution: { labCode: string; result: number }[], assignedValue: number, sigmaPt: number, ownCode: string): HistogramBin[] {
  const width = sigmaPt / 2;
  const indexOf = (x: number) => Math.floor((x - assignedValue) / width + 0.5);
  const indices = distribution.map((d) => indexOf(d.result));
  const low = Math.min(-6, ...indices);
  const high = Math.max(6, ...indices);
  const bins: HistogramBin[] = [];
  for (let i = low; i <= high; i++) {
    const inside = distribution.filter((_, k) => indices[k] === i);
    bins.push({
      from: assignedValue + (i - 0.5) * width,
      to: assignedValue + (i + 0.5) * width,
      labCodes: inside.map((d) => d.labCode),
      own: inside.some((d) => d.labCode === ownCode),
    });
  }
  return bins;
}

export function histogramOption(bins: HistogramBin[], assignedValue: number, sigmaPt: number, unit: string, decimals: number): ChartOption {
  const label = (b: HistogramBin) => ((b.from + b.to) / 2).toFixed(decimals);
  const centreIndex = bins.findIndex((b) => b.from <= assignedValue && assignedValue < b.to);
  const at = (k: number) => bins.findIndex((b) => b.from <= assignedValue + k * sigmaPt && assignedValue + k * sigmaPt < b.to);
  return {
    grid: { left: 48, right: 16, top: 24, bottom: 48 },
    tooltip: { trigger: "axis" },
    xAxis: { type: "category", data: bins.map(label), name: unit || "result", nameLocation: "middle", nameGap: 32 },
    yAxis: { type: "value", name: "labs", minInterval: 1 },
    series: [
      {
        type: "bar",
        name: "labs",
        barCategoryGap: "5%",
        data: bins.map((b) => ({ value: b.labCodes.length, itemStyle: { color: b.own ? CHART_COLOURS.critical : CHART_COLOURS.bar } })),
        markLine: {
          symbol: "none",
          data: [
            { xAxis: centreIndex, name: "x_pt", lineStyle: { color: CHART_COLOURS.ink, width: 2 }, label: { formatter: "x_pt" } },
            ...[-3, -2, 2, 3].flatMap((k) => {
              const index = at(k);
              return index < 0 ? [] : [{ xAxis: index, lineStyle: { color: Math.abs(k) === 3 ? CHART_COLOURS.flagged : CHART_COLOURS.critical, type: "dashed" }, label: { formatter: `${k > 0 ? "+" : ""}${k}σ` } }];
            }),
          ],
        },
      },
    ],
  };
}

export type HistoryPoint = { round: string; material: string; response: string; score: number; scoreKind: string };

/** The lab's scores round after round, one line per material × response, with the ±2 and ±3 limits. */
export function historyOption(points: HistoryPoint[]): ChartOption {
  const rounds = [...new Set(points.map((p) => p.round))];
  const series = [...new Set(points.map((p) => `${p.material} · ${p.response}`))];
  const limit = (value: number, colour: string) => ({ yAxis: value, lineStyle: { color: colour, type: "dashed" }, label: { formatter: `${value > 0 ? "+" : ""}${value}` } });
  return {
    grid: { left: 48, right: 16, top: 32, bottom: 48 },
    tooltip: { trigger: "axis" },
    legend: { top: 0 },
    xAxis: { type: "category", data: rounds, name: "round", nameLocation: "middle", nameGap: 32 },
    yAxis: { type: "value", name: "score", min: (v: { min: number }) => Math.min(-4, Math.floor(v.min)), max: (v: { max: number }) => Math.max(4, Math.ceil(v.max)) },
    series: series.map((name, i) => ({
      type: "line",
      name,
      symbolSize: 8,
      data: rounds.map((round) => points.find((p) => p.round === round && `${p.material} · ${p.response}` === name)?.score ?? null),
      ...(i === 0 && {
        markLine: {
          symbol: "none",
          data: [limit(-3, CHART_COLOURS.flagged), limit(-2, CHART_COLOURS.critical), limit(2, CHART_COLOURS.critical), limit(3, CHART_COLOURS.flagged)],
        },
      }),
    })),
  };
}
