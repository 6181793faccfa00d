import { averageOfCellAverages, averageReplicates, mostFrequentReplicates, replicateWeightedMean, standardDeviationOfCellAverages } from "./cell-averages";
import { cellStatistics, type CellStatistics } from "./cell-statistics";
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

type Cell = CellStatistics & { lab: string };
type ComputedCell = Cell & { variance: number; sd: number };

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

function consistencyFindings(h: number | null, k: number | null, hLimit: number, kLimit: number, alpha: SignificanceLevel): Finding[] {
  const findings: Finding[] = [];
  const level = `ASTM E691 ${alpha === 0.005 ? "" : "/ ISO 5725-2 "}at ${ALPHA_TEXT[alpha]}`;
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
      text: `h = ${fixed(h, 2)}, beyond ±${fixed(hLimit, 2)} (${level})`,
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
      text: `k = ${fixed(k, 2)}, above ${fixed(kLimit, 2)} (${level})`,
    });
  }
  return findings;
}

/**
 * The precision statistics of one group. Cells come in working units
 * (x − origin)/scale; every figure is computed in them and taken back to the
 * response's units at the end (h, k, C and G are ratios and need no change).
 */
function computePrecision(
  group: GroupAccumulator,
  cells: readonly ComputedCell[],
  alpha: SignificanceLevel,
  units: { origin: number; scale: number },
): ComputedGroup {
  const notes: string[] = [];
  const { origin, scale } = units;
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
  let sd2: number;
  let criticalN: number;
  if (replicatesEqual) {
    mean = averageOfAverages;
    sr = repeatabilityStandardDeviation(cells.map((cell) => cell.sd));
    sL2 = betweenLabVariance(sx, sr, n);
    sd2 = n * sx * sx;
    criticalN = n;
  } else {
    mean = replicateWeightedMean(cells);
    sr = pooledRepeatabilityStandardDeviation(cells);
    sd2 = betweenCellVariance(cells, mean);
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
  const screening = screenCells({ labs: cells.map((cell) => cell.lab), means, variances: cells.map((cell) => cell.variance), n: criticalN });
  const isoFindings = screeningFindings(screening.steps);
  const labs: LabResult[] = cells.map((cell) => {
    const d = cell.mean - averageOfAverages;
    const h = hStatistic(d, sx);
    const k = kStatistic(cell.sd, sr);
    const flags: ConsistencyFlag[] = [];
    if (h !== null && Math.abs(h) > hLimit) flags.push("h");
    if (k !== null && k > kLimit) flags.push("k");
    return {
      lab: cell.lab,
      n: cell.n,
      mean: origin + scale * cell.mean,
      sd: scale * cell.sd,
      d: scale * d,
      h,
      k,
      flags,
      findings: [...consistencyFindings(h, k, hLimit, kLimit, alpha), ...(isoFindings.get(cell.lab) ?? [])],
    };
  });

  const srOut = scale * sr;
  const sROut = scale * sR;
  const repeatabilityForms = c670Limits(srOut, generalMean);
  const reproducibilityForms = c670Limits(sROut, generalMean);
  const dfr = counts.reduce((sum, count) => sum + count - 1, 0);
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
  const cells: Cell[] = [];
  const damagedLabs = new Set<string>();
  const inputProblems = [...group.problems];
  const units = workingUnits(values, group.cells);
  for (const cell of group.cells) {
    if (cell.count > 0) {
      const { n, mean, variance, sd } = cellStatistics(values, cell.start, cell.start + cell.count, units.origin, units.scale);
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
    return { result: computePrecision(group, cells as ComputedCell[], alpha, units), problems };
  }
  const labs: LabResult[] = cells.map((cell) => ({
    lab: cell.lab,
    n: cell.n,
    mean: units.origin + units.scale * cell.mean,
    sd: cell.sd === null ? null : units.scale * cell.sd,
    d: null,
    h: null,
    k: null,
    flags: [],
    findings: [],
  }));
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
