import { readFileSync } from "node:fs";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { analyzeStudy } from "./analyze-study";
import { standardDeviationOfCellAverages } from "./cell-averages";
import { cellStatistics } from "./cell-statistics";
import { pooledRepeatabilityStandardDeviation, repeatabilityStandardDeviation } from "./repeatability";
import { betweenCellVariance, betweenLabVariance, generalBetweenLabVariance } from "./reproducibility";
import type { ComputedGroup, ResultRow } from "./types";

// NIST StRD one-way ANOVA "SiRstv" (tests/fixtures/nist-strd-anova-SiRstv.csv): 5 instruments
// read as 5 labs of one material, 5 replicates each.
const fixture = readFileSync(new URL("../../../tests/fixtures/nist-strd-anova-SiRstv.csv", import.meta.url), "utf8");
const records = Papa.parse<{ instrument: string; resistance: string }>(fixture.trim(), { header: true }).data;
const replicateCounter = new Map<string, number>();
const rows: ResultRow[] = records.map((record) => {
  const replicate = (replicateCounter.get(record.instrument) ?? 0) + 1;
  replicateCounter.set(record.instrument, replicate);
  return { lab: `I${record.instrument}`, material: "SiR", response: "resistivity", replicate, value: Number(record.resistance) };
});
function valuesByLab(results: readonly ResultRow[]): number[][] {
  const cells = new Map<string, number[]>();
  for (const row of results) cells.set(row.lab, [...(cells.get(row.lab) ?? []), row.value]);
  return [...cells.values()];
}
const cellValues = valuesByLab(rows);

// NIST StRD certified values for SiRstv.
const CERTIFIED_WITHIN_MEAN_SQUARE = 1.0831828e-2;
const CERTIFIED_BETWEEN_MEAN_SQUARE = 1.27865654e-2;
const CERTIFIED_RESIDUAL_SD = 1.04076068334656e-1;
const n = 5;
// Mapping to E691 figures as in the shared reference README: s_r² = within MS,
// s_x̄² = between MS / n, s_L² = (between MS − within MS)/n, s_R² = s_L² + s_r².
const expectedSr = Math.sqrt(CERTIFIED_WITHIN_MEAN_SQUARE);
const expectedSx = Math.sqrt(CERTIFIED_BETWEEN_MEAN_SQUARE / n);
const expectedSL = Math.sqrt((CERTIFIED_BETWEEN_MEAN_SQUARE - CERTIFIED_WITHIN_MEAN_SQUARE) / n);
const expectedSR = Math.sqrt(expectedSL ** 2 + expectedSr ** 2);

/** Relative error; 1e-12 is far inside the 9 significant digits asked of the engine. */
const relativeError = (actual: number, expected: number) => Math.abs(actual / expected - 1);
const EXACT = 1e-12;

describe("NIST StRD SiRstv", () => {
  const group = analyzeStudy(rows).groups[0] as ComputedGroup;

  it("analyzeStudy gives s_r, s_x̄, s_L and s_R from the certified mean squares", () => {
    expect(group.status).toBe("computed");
    expect(group.p).toBe(5);
    expect(group.n).toBe(5);
    expect(relativeError(group.sr, expectedSr)).toBeLessThan(EXACT);
    expect(relativeError(group.sr, CERTIFIED_RESIDUAL_SD)).toBeLessThan(EXACT);
    expect(relativeError(group.sx, expectedSx)).toBeLessThan(EXACT);
    expect(relativeError(group.sL, expectedSL)).toBeLessThan(1e-11);
    expect(relativeError(group.sR, expectedSR)).toBeLessThan(EXACT);
    expect(relativeError(group.r, 2.8 * expectedSr)).toBeLessThan(EXACT);
  });

  it("the building blocks reproduce the certified mean squares", () => {
    const cells = cellValues.map((values) => cellStatistics(values));
    const sr = repeatabilityStandardDeviation(cells.map((cell) => cell.sd as number));
    const sx = standardDeviationOfCellAverages(cells.map((cell) => cell.mean));
    expect(relativeError(sr ** 2, CERTIFIED_WITHIN_MEAN_SQUARE)).toBeLessThan(EXACT);
    expect(relativeError(n * sx ** 2, CERTIFIED_BETWEEN_MEAN_SQUARE)).toBeLessThan(EXACT);
  });

  it("centres before squaring: the textbook Σx² − (Σx)²/n misses the certified value by far more", () => {
    const naiveWithin =
      cellValues.reduce((sum, values) => {
        const total = values.reduce((s, x) => s + x, 0);
        const squares = values.reduce((s, x) => s + x * x, 0);
        return sum + (squares - (total * total) / values.length) / (values.length - 1);
      }, 0) / cellValues.length;
    expect(relativeError(naiveWithin, CERTIFIED_WITHIN_MEAN_SQUARE)).toBeGreaterThan(100 * EXACT);
    expect(relativeError(group.sr ** 2, CERTIFIED_WITHIN_MEAN_SQUARE)).toBeLessThan(EXACT);
  });

  it("with equal replicates the ISO 5725-2 general formulas give E691's figures", () => {
    const cells = cellValues.map((values) => cellStatistics(values) as { n: number; mean: number; variance: number; sd: number });
    const e691Sr = repeatabilityStandardDeviation(cells.map((cell) => cell.sd));
    const isoSr = pooledRepeatabilityStandardDeviation(cells);
    expect(relativeError(isoSr, e691Sr)).toBeLessThan(1e-14);
    const sx = standardDeviationOfCellAverages(cells.map((cell) => cell.mean));
    const mean = cells.reduce((sum, cell) => sum + cell.mean, 0) / cells.length;
    const e691SL2 = betweenLabVariance(sx, e691Sr, n);
    const isoSL2 = generalBetweenLabVariance(betweenCellVariance(cells, mean), isoSr, n);
    expect(relativeError(isoSL2, e691SL2)).toBeLessThan(1e-12);
  });
});

describe("SiRstv with unequal replicates", () => {
  // Reference: SciPy 1.17.1 / NumPy one-way ANOVA of the same subset (tests/fixtures/precision-scipy-reference.py).
  const reference = JSON.parse(
    readFileSync(new URL("../../../tests/fixtures/precision-scipy-reference.json", import.meta.url), "utf8"),
  ).unbalancedSiRstv as { droppedLastReplicates: Record<string, number>; msBetween: number; msWithin: number; n0: number; fOneway: number };
  const unbalanced = rows.filter((row) => {
    const dropped = reference.droppedLastReplicates[row.lab.slice(1)] ?? 0;
    return row.replicate <= n - dropped;
  });
  const group = analyzeStudy(unbalanced).groups[0] as ComputedGroup;

  it("follows the ISO 5725-2 general formulas: s_r² = within MS, n̄ = n₀, s_L² = (between MS − within MS)/n̄", () => {
    expect(group.status).toBe("computed");
    expect(group.replicatesEqual).toBe(false);
    expect(relativeError(group.n, reference.n0)).toBeLessThan(1e-14);
    expect(relativeError(group.sr ** 2, reference.msWithin)).toBeLessThan(1e-10);
    // Between MS below within MS here: the between-lab variance is negative, so s_L = 0 and s_R = s_r.
    expect(reference.msBetween).toBeLessThan(reference.msWithin);
    expect(group.sL).toBe(0);
    expect(group.sR).toBe(group.sr);
    expect(group.notes.join(" ")).toMatch(/n̄/);
    expect(group.notes.join(" ")).toMatch(/negative/);
  });

  it("s_d² / s_r² is SciPy's one-way ANOVA F statistic", () => {
    const cells = valuesByLab(unbalanced).map((values) => cellStatistics(values));
    const sd2 = betweenCellVariance(cells, group.mean);
    expect(relativeError(sd2, reference.msBetween)).toBeLessThan(1e-10);
    expect(relativeError(sd2 / group.sr ** 2, reference.fOneway)).toBeLessThan(1e-10);
  });
});
