import {
  averageOfCellAverages,
  averageReplicates,
  mostFrequentReplicates,
  replicateWeightedMean,
  standardDeviationOfCellAverages,
} from "./cell-averages";
import { cellStatistics, type CellStatistics } from "./cell-statistics";
import { cochranC, cochranCritical } from "./cochran";
import { hCritical, hStatistic, kCritical, kStatistic } from "./consistency";
import { grubbsDouble, grubbsSingle, grubbsSingleCritical } from "./grubbs";
import { GRUBBS_DOUBLE_MAX_LABS, GRUBBS_DOUBLE_MIN_LABS, grubbsDoubleCritical } from "./grubbs-double-critical";
import type { GroupAccumulator } from "./group-rows";
import { c670Limits, coefficientOfVariation, precisionLimit } from "./limits";
import { outlierClass } from "./outlier-class";
import { pooledRepeatabilityStandardDeviation, repeatabilityStandardDeviation } from "./repeatability";
import {
  betweenCellVariance,
  betweenLabStandardDeviation,
  betweenLabVariance,
  generalBetweenLabVariance,
  reproducibilityStandardDeviation,
} from "./reproducibility";
import type { SignificanceLevel } from "./significance";
import type { ComputedGroup, ConsistencyFlag, GrubbsResult, GroupResult, LabResult, Problem } from "./types";

/** Fewest labs, and fewest replicates per lab, that give precision statistics (ASTM E691). */
export const MIN_LABS = 3;
export const MIN_REPLICATES = 2;

type Cell = CellStatistics & { lab: string };
type ComputedCell = Cell & { variance: number; sd: number };

function grubbsTests(cells: readonly Cell[], notes: string[]): GrubbsResult {
  const p = cells.length;
  const means = cells.map((cell) => cell.mean);
  const single = grubbsSingle(means);
  const critical5 = grubbsSingleCritical(p, 0.05);
  const critical1 = grubbsSingleCritical(p, 0.01);
  const singleResult = ({ G, index }: { G: number | null; index: number }) => ({
    G,
    lab: cells[index].lab,
    critical5,
    critical1,
    class: outlierClass(G, critical5, critical1, "above"),
  });
  const doubleCritical = grubbsDoubleCritical(p);
  if (doubleCritical === null) {
    notes.push(
      `the double Grubbs test is evaluated for ${GRUBBS_DOUBLE_MIN_LABS} to ${GRUBBS_DOUBLE_MAX_LABS} labs (the range ISO 5725-2 tabulates); this group has ${p}`,
    );
    return { high: singleResult(single.high), low: singleResult(single.low), doubleHigh: null, doubleLow: null };
  }
  const double = grubbsDouble(means);
  const doubleResult = ({ G, indices }: { G: number | null; indices: [number, number] }) => ({
    G,
    labs: [cells[indices[0]].lab, cells[indices[1]].lab] as [string, string],
    critical5: doubleCritical.critical5,
    critical1: doubleCritical.critical1,
    class: outlierClass(G, doubleCritical.critical5, doubleCritical.critical1, "below"),
  });
  return {
    high: singleResult(single.high),
    low: singleResult(single.low),
    doubleHigh: doubleResult(double.high),
    doubleLow: doubleResult(double.low),
  };
}

function computePrecision(group: GroupAccumulator, cells: readonly ComputedCell[], alpha: SignificanceLevel): ComputedGroup {
  const notes: string[] = [];
  const p = cells.length;
  const counts = cells.map((cell) => cell.n);
  const means = cells.map((cell) => cell.mean);
  const replicatesEqual = counts.every((count) => count === counts[0]);
  const n = averageReplicates(counts);
  const sx = standardDeviationOfCellAverages(means);
  const averageOfAverages = averageOfCellAverages(means);

  let mean: number;
  let sr: number;
  let sL2: number;
  let criticalN: number;
  if (replicatesEqual) {
    mean = averageOfAverages;
    sr = repeatabilityStandardDeviation(cells.map((cell) => cell.sd));
    sL2 = betweenLabVariance(sx, sr, n);
    criticalN = n;
  } else {
    mean = replicateWeightedMean(cells);
    sr = pooledRepeatabilityStandardDeviation(cells);
    sL2 = generalBetweenLabVariance(betweenCellVariance(cells, mean), sr, n);
    criticalN = mostFrequentReplicates(counts);
    notes.push(
      `unequal replicates (${Math.min(...counts)} to ${Math.max(...counts)} per lab): n is the ISO 5725-2 effective n̄ = ${n}; ` +
        "mean, s_r and s_L follow the ISO 5725-2 general formulas (mean weighted by replicates); " +
        "d and h compare each cell average with the plain average of cell averages, as E691 defines them; " +
        `k and Cochran's critical values use the most frequent replicate count, ${criticalN}`,
    );
  }
  const sL = betweenLabStandardDeviation(sL2);
  if (sL2 < 0) notes.push(`the between-lab variance estimate came out negative (${sL2}); s_L is taken as 0 and s_R = s_r`);
  const sR = reproducibilityStandardDeviation(sL, sr);
  if (sx === 0) notes.push("all cell averages are equal (s_x̄ = 0): h is undefined");
  if (sr === 0) notes.push("no cell shows any spread (s_r = 0): k is undefined");
  if (mean === 0) notes.push("the mean is 0: coefficients of variation and % forms are undefined");

  const hLimit = hCritical(p, alpha);
  const kLimit = kCritical(p, criticalN, alpha);
  const labs: LabResult[] = cells.map((cell) => {
    const d = cell.mean - averageOfAverages;
    const h = hStatistic(d, sx);
    const k = kStatistic(cell.sd, sr);
    const flags: ConsistencyFlag[] = [];
    if (h !== null && Math.abs(h) > hLimit) flags.push("h");
    if (k !== null && k > kLimit) flags.push("k");
    return { lab: cell.lab, n: cell.n, mean: cell.mean, sd: cell.sd, d, h, k, flags };
  });

  const cochran = cochranC(cells.map((cell) => cell.variance));
  const cochranCritical5 = cochranCritical(p, criticalN, 0.05);
  const cochranCritical1 = cochranCritical(p, criticalN, 0.01);
  const repeatabilityForms = c670Limits(sr, mean);
  const reproducibilityForms = c670Limits(sR, mean);

  return {
    status: "computed",
    material: group.material,
    response: group.response,
    kind: group.kind,
    p,
    n,
    replicatesEqual,
    mean,
    sx,
    sr,
    sL,
    sR,
    r: precisionLimit(sr),
    R: precisionLimit(sR),
    cvr: coefficientOfVariation(sr, mean),
    cvR: coefficientOfVariation(sR, mean),
    oneSr: repeatabilityForms.oneS,
    d2sr: repeatabilityForms.d2s,
    oneSrPercent: repeatabilityForms.oneSPercent,
    d2srPercent: repeatabilityForms.d2sPercent,
    oneSR: reproducibilityForms.oneS,
    d2sR: reproducibilityForms.d2s,
    oneSRPercent: reproducibilityForms.oneSPercent,
    d2sRPercent: reproducibilityForms.d2sPercent,
    alpha,
    hCritical: hLimit,
    kCritical: kLimit,
    cochran: {
      C: cochran.C,
      critical5: cochranCritical5,
      critical1: cochranCritical1,
      class: outlierClass(cochran.C, cochranCritical5, cochranCritical1, "above"),
      lab: cochran.C === null ? null : cells[cochran.index].lab,
    },
    grubbs: grubbsTests(cells, notes),
    labs,
    notes,
  };
}

function groupProblem(group: GroupAccumulator, code: Problem["code"], message: string, lab?: string): Problem {
  return { code, message: `${group.material} / ${group.response}: ${message}`, material: group.material, response: group.response, lab };
}

/**
 * One (material, response) group, after exclusions: its precision statistics,
 * or, when its input has problems or too few labs or replicates, the cell
 * statistics and the reasons. `values` is the grouping's shared buffer the
 * cells index into. Returns the group-level problems it found.
 */
export function analyzeGroup(
  group: GroupAccumulator,
  values: Float64Array,
  alpha: SignificanceLevel,
): { result: GroupResult; problems: Problem[] } {
  const cells: Cell[] = [];
  const damagedLabs = new Set<string>();
  const inputProblems = [...group.problems];
  for (const cell of group.cells) {
    if (cell.count > 0) {
      const { n, mean, variance, sd } = cellStatistics(values, cell.start, cell.start + cell.count);
      cells.push({ lab: cell.lab, n, mean, variance, sd });
    }
    if (cell.problems.length > 0) {
      damagedLabs.add(cell.lab);
      inputProblems.push(...cell.problems);
    }
  }
  const problems: Problem[] = [];
  if (cells.length < MIN_LABS) {
    problems.push(
      groupProblem(group, "too-few-labs", `precision statistics need at least ${MIN_LABS} labs with results; this group has ${cells.length}`),
    );
  }
  // A damaged cell's shortfall is already explained by its row problems.
  for (const cell of cells) {
    if (cell.n < MIN_REPLICATES && !damagedLabs.has(cell.lab)) {
      problems.push(
        groupProblem(
          group,
          "too-few-replicates",
          `lab ${cell.lab} has ${cell.n} result; every lab needs at least ${MIN_REPLICATES} (exclude the cell to compute the others)`,
          cell.lab,
        ),
      );
    }
  }
  if (inputProblems.length === 0 && problems.length === 0) {
    return { result: computePrecision(group, cells as ComputedCell[], alpha), problems };
  }
  const labs: LabResult[] = cells.map((cell) => ({ lab: cell.lab, n: cell.n, mean: cell.mean, sd: cell.sd, d: null, h: null, k: null, flags: [] }));
  const reasons = [...inputProblems, ...problems].map((problem) => problem.message);
  return {
    result: {
      status: "not-computed",
      material: group.material,
      response: group.response,
      kind: group.kind,
      p: cells.length,
      n: cells.length > 0 ? averageReplicates(cells.map((cell) => cell.n)) : 0,
      labs,
      notes: [],
      reasons,
    },
    problems,
  };
}
