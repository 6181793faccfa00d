import { averageOfCellAverages, averageReplicates, mostFrequentReplicates, replicateWeightedMean, standardDeviationOfCellAverages } from "./cell-averages";
import { cellStatistics } from "./cell-statistics";
import { repeatabilityInterval, reproducibilityInterval } from "./confidence-intervals";
import { hCritical, hStatistic, kCritical, kStatistic } from "./consistency";
import type { GroupAccumulator } from "./group-rows";
import { repeatabilityUncertainty, reproducibilityUncertainty } from "./iso-uncertainty";
import { c670Limits, coefficientOfVariation, precisionLimit } from "./limits";
import { pooledRepeatabilityStandardDeviation, repeatabilityStandardDeviation } from "./repeatability";
import { betweenCellVariance, betweenLabStandardDeviation, betweenLabVariance, generalBetweenLabVariance, reproducibilityStandardDeviation } from "./reproducibility";
import { screenCells } from "./screening";
import type { SignificanceLevel } from "./significance";
import { significanceDescription } from "./significance-text";
import type { ComputedGroup, ConsistencyFlag, Finding, GroupResult, LabResult, Problem, ScreeningStep } from "./types";
import { workingUnits } from "./working-units";

/** Fewest labs, and fewest replicates per lab, that give precision statistics (ASTM E691). */
export const MIN_LABS = 3;
export const MIN_REPLICATES = 2;

/**
 * A group's cells with results, in working units, as one list per figure (in
 * order of first appearance): the formulas over all cells take lists, and a
 * study of many labs would otherwise build an object per cell only to take
 * them apart again.
 */
interface CellLists {
  labs: string[];
  counts: number[];
  means: number[];
  /** null for a cell of one result */
  variances: (number | null)[];
  sds: (number | null)[];
}

/** The lists of a group that is computed: every cell has at least two results. */
type ComputedCellLists = CellLists & { variances: number[]; sds: number[] };

const ALPHA_TEXT: Record<SignificanceLevel, string> = { 0.005: "0.5 %", 0.01: "1 %", 0.05: "5 %" };
const TEST_NAME: Record<ScreeningStep["test"], string> = {
  cochran: "Cochran's test",
  "grubbs-single": "Grubbs' single test",
  "grubbs-double": "Grubbs' double test",
};

function fixed(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : String(x);
}

/** The ISO 5725-2 findings of the screening steps that flagged, per lab. */
function screeningFindings(steps: readonly ScreeningStep[]): Map<string, Finding[]> {
  const byLab = new Map<string, Finding[]>();
  for (const step of steps) {
    if (step.outcome !== "flagged" || step.statistic === null) continue;
    const digits = step.test === "grubbs-single" ? 3 : 4;
    const bound = step.test === "grubbs-double" ? "below" : "above";
    const beyond = step.class === "outlier" ? step.critical1 : step.critical5;
    const where = step.side === null ? "" : ` (${step.side} side${step.test === "grubbs-double" ? `, pair ${step.labs.join(" + ")}` : ""})`;
    const text =
      `${TEST_NAME[step.test]}${where}: ${step.test === "cochran" ? "C" : "G"} = ${fixed(step.statistic, digits)}, ${bound} the ` +
      `${step.class === "outlier" ? "1 %" : "5 %"} critical value ${fixed(beyond ?? Number.NaN, digits)} ` +
      `(5 %: ${fixed(step.critical5 ?? Number.NaN, digits)}, 1 %: ${fixed(step.critical1 ?? Number.NaN, digits)}; ISO 5725-2) — ${step.class}`;
    for (const lab of step.labs) {
      const finding: Finding = {
        test: step.test,
        side: step.side,
        statistic: step.statistic,
        critical: null,
        critical5: step.critical5,
        critical1: step.critical1,
        class: step.class,
        partner: step.test === "grubbs-double" ? (step.labs.find((other) => other !== lab) ?? null) : null,
        text,
      };
      const list = byLab.get(lab);
      if (list === undefined) byLab.set(lab, [finding]);
      else list.push(finding);
    }
  }
  return byLab;
}

/** How the h and k critical values were chosen, as a finding's text names it. */
function consistencyLevel(alpha: SignificanceLevel): string {
  return `ASTM E691 ${alpha === 0.005 ? "" : "/ ISO 5725-2 "}at ${ALPHA_TEXT[alpha]}`;
}

function consistencyFindings(h: number | null, k: number | null, hLimit: number, kLimit: number, alpha: SignificanceLevel): Finding[] {
  const findings: Finding[] = [];
  if (h !== null && Math.abs(h) > hLimit) {
    findings.push({
      test: "h",
      side: h > 0 ? "high" : "low",
      statistic: h,
      critical: hLimit,
      critical5: null,
      critical1: null,
      class: null,
      partner: null,
      text: `h = ${fixed(h, 2)}, beyond ±${fixed(hLimit, 2)} (${consistencyLevel(alpha)})`,
    });
  }
  if (k !== null && k > kLimit) {
    findings.push({
      test: "k",
      side: null,
      statistic: k,
      critical: kLimit,
      critical5: null,
      critical1: null,
      class: null,
      partner: null,
      text: `k = ${fixed(k, 2)}, above ${fixed(kLimit, 2)} (${consistencyLevel(alpha)})`,
    });
  }
  return findings;
}

/** Each cell's statistics in working units (ASTM E691), list by list. */
function cellLists(group: GroupAccumulator, values: Float64Array, units: { origin: number; scale: number }): CellLists {
  const lists: CellLists = { labs: [], counts: [], means: [], variances: [], sds: [] };
  for (const cell of group.cells) {
    if (cell.count === 0) continue;
    const { n, mean, variance, sd } = cellStatistics(values, cell.start, cell.start + cell.count, units.origin, units.scale);
    lists.labs.push(cell.lab);
    lists.counts.push(n);
    lists.means.push(mean);
    lists.variances.push(variance);
    lists.sds.push(sd);
  }
  return lists;
}

/** Degrees of freedom within the cells, Σ(n_i − 1); p(n − 1) with equal replicates. */
function withinCellDegreesOfFreedom(counts: readonly number[]): number {
  let df = 0;
  for (const count of counts) df += count - 1;
  return df;
}

/**
 * The precision statistics of one group. Cells come in working units
 * (x − origin)/scale; every figure is computed in them and taken back to the
 * response's units at the end (h, k, C and G are ratios and need no change).
 */
function computePrecision(
  group: GroupAccumulator,
  cells: ComputedCellLists,
  alpha: SignificanceLevel,
  units: { origin: number; scale: number },
): ComputedGroup {
  const notes: string[] = [];
  const { origin, scale } = units;
  const { counts, means, variances, sds } = cells;
  const p = counts.length;
  const replicatesEqual = counts.every((count) => count === counts[0]);
  const n = averageReplicates(counts);
  const sx = standardDeviationOfCellAverages(means);
  const averageOfAverages = averageOfCellAverages(means);

  let mean: number;
  let sr: number;
  let sL2: number;
  let sd2: number;
  let criticalN: number;
  if (replicatesEqual) {
    mean = averageOfAverages;
    sr = repeatabilityStandardDeviation(sds);
    sL2 = betweenLabVariance(sx, sr, n);
    sd2 = n * sx * sx;
    criticalN = n;
  } else {
    const weighted = counts.map((count, i) => ({ n: count, mean: means[i], variance: variances[i] }));
    mean = replicateWeightedMean(weighted);
    sr = pooledRepeatabilityStandardDeviation(weighted);
    sd2 = betweenCellVariance(weighted, mean);
    sL2 = generalBetweenLabVariance(sd2, sr, n);
    criticalN = mostFrequentReplicates(counts);
    notes.push(
      `unequal replicates (${Math.min(...counts)} to ${Math.max(...counts)} per lab): n is the ISO 5725-2 effective n̄ = ${n}; ` +
        "mean, s_r and s_L follow the ISO 5725-2 general formulas (mean weighted by replicates); " +
        "d and h compare each cell average with the plain average of cell averages, as E691 defines them; " +
        `k and Cochran's critical values use the most frequent replicate count, ${criticalN}`,
    );
  }
  const sL = betweenLabStandardDeviation(sL2);
  if (sL2 < 0) notes.push(`the between-lab variance estimate came out negative (${sL2 * scale * scale}); s_L is taken as 0 and s_R = s_r`);
  const sR = reproducibilityStandardDeviation(sL, sr);
  if (sx === 0) notes.push("all cell averages are equal (s_x̄ = 0): h is undefined");
  if (sr === 0) notes.push("no cell shows any spread (s_r = 0): k is undefined");
  const generalMean = origin + scale * mean;
  if (generalMean === 0) notes.push("the mean is 0: coefficients of variation and % forms are undefined");

  const hLimit = hCritical(p, alpha);
  const kLimit = kCritical(p, criticalN, alpha);
  const screening = screenCells({ labs: cells.labs, means, variances, n: criticalN });
  const isoFindings = screeningFindings(screening.steps);
  const labs: LabResult[] = cells.labs.map((lab, i) => {
    const d = means[i] - averageOfAverages;
    const h = hStatistic(d, sx);
    const k = kStatistic(sds[i], sr);
    const flags: ConsistencyFlag[] = [];
    if (h !== null && Math.abs(h) > hLimit) flags.push("h");
    if (k !== null && k > kLimit) flags.push("k");
    const findings = consistencyFindings(h, k, hLimit, kLimit, alpha);
    const screened = isoFindings.get(lab);
    if (screened !== undefined) findings.push(...screened);
    return {
      lab,
      n: counts[i],
      mean: origin + scale * means[i],
      sd: scale * sds[i],
      d: scale * d,
      h,
      k,
      flags,
      findings,
    };
  });

  const srOut = scale * sr;
  const sROut = scale * sR;
  const repeatabilityForms = c670Limits(srOut, generalMean);
  const reproducibilityForms = c670Limits(sROut, generalMean);
  const dfr = withinCellDegreesOfFreedom(counts);
  const gamma = sr > 0 ? sR / sr : 1;
  const uncertainty = {
    sr: repeatabilityInterval(srOut, dfr),
    sR:
      sr > 0 || sR > 0
        ? reproducibilityInterval({ sR: sROut, sr: srOut, sd2: sd2 * scale * scale, nBar: n, p, dfr, sLClamped: sL2 <= 0 })
        : repeatabilityInterval(sROut, dfr),
    Ar: repeatabilityUncertainty(p, n),
    AR: reproducibilityUncertainty(p, n, gamma),
    gamma,
  };

  return {
    status: "computed",
    material: group.material,
    response: group.response,
    kind: group.kind,
    p,
    n,
    replicatesEqual,
    mean: generalMean,
    sx: scale * sx,
    sr: srOut,
    sL: scale * sL,
    sR: sROut,
    r: precisionLimit(srOut),
    R: precisionLimit(sROut),
    cvr: coefficientOfVariation(srOut, generalMean),
    cvR: coefficientOfVariation(sROut, generalMean),
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
    significance: significanceDescription(alpha),
    cochran: screening.cochran,
    grubbs: screening.grubbs,
    screening: screening.steps,
    uncertainty,
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
  const damagedLabs = new Set<string>();
  const inputProblems = [...group.problems];
  for (const cell of group.cells) {
    if (cell.problems.length > 0) {
      damagedLabs.add(cell.lab);
      inputProblems.push(...cell.problems);
    }
  }
  const units = workingUnits(values, group.cells);
  const cells = cellLists(group, values, units);
  const p = cells.labs.length;
  const problems: Problem[] = [];
  if (p < MIN_LABS) {
    problems.push(groupProblem(group, "too-few-labs", `precision statistics need at least ${MIN_LABS} labs with results; this group has ${p}`));
  }
  // A damaged cell's shortfall is already explained by its row problems.
  for (let i = 0; i < p; i++) {
    const lab = cells.labs[i];
    const n = cells.counts[i];
    if (n < MIN_REPLICATES && !damagedLabs.has(lab)) {
      problems.push(
        groupProblem(
          group,
          "too-few-replicates",
          `lab ${lab} has ${n} result; every lab needs at least ${MIN_REPLICATES} (exclude the cell to compute the others)`,
          lab,
        ),
      );
    }
  }
  if (inputProblems.length === 0 && problems.length === 0) {
    return { result: computePrecision(group, cells as ComputedCellLists, alpha, units), problems };
  }
  const labs: LabResult[] = cells.labs.map((lab, i) => {
    const sd = cells.sds[i];
    return {
      lab,
      n: cells.counts[i],
      mean: units.origin + units.scale * cells.means[i],
      sd: sd === null ? null : units.scale * sd,
      d: null,
      h: null,
      k: null,
      flags: [],
      findings: [],
    };
  });
  const reasons = [...inputProblems, ...problems].map((problem) => problem.message);
  return {
    result: {
      status: "not-computed",
      material: group.material,
      response: group.response,
      kind: group.kind,
      p,
      n: p > 0 ? averageReplicates(cells.counts) : 0,
      labs,
      notes: [],
      reasons,
    },
    problems,
  };
}
