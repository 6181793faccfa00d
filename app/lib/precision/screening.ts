import { cochranC, cochranCritical } from "./cochran";
import { grubbsDouble, grubbsSingle, grubbsSingleCritical } from "./grubbs";
import { GRUBBS_DOUBLE_MAX_LABS, GRUBBS_DOUBLE_MIN_LABS, grubbsDoubleCritical } from "./grubbs-double-critical";
import { outlierClass } from "./outlier-class";
import type { CochranResult, GrubbsDoubleResult, GrubbsResult, GrubbsSingleResult, ScreeningStep } from "./types";

/** A share of a sum of squares this small is rounding, not spread: the values are tied. */
const TIE_SHARE = 1e-20;

/**
 * Σ(x − x̄)² over the values, each set about its own mean, leaving out those at
 * the indices `without` names (−1 for none): the same sums a filtered copy
 * would give, without the copy.
 */
function sumOfSquares(values: readonly number[], without = -1, alsoWithout = -1): number {
  let count = 0;
  let sum = 0;
  for (let i = 0; i < values.length; i++) {
    if (i === without || i === alsoWithout) continue;
    sum += values[i];
    count++;
  }
  if (count === 0) return 0;
  const mean = sum / count;
  let squares = 0;
  for (let i = 0; i < values.length; i++) {
    if (i === without || i === alsoWithout) continue;
    squares += (values[i] - mean) ** 2;
  }
  return squares;
}

/** The labs whose cell average is `average`, leaving out the lab at index `without` (−1 for none). */
function labsAveraging(labs: readonly string[], means: readonly number[], average: number, without = -1): string[] {
  const found: string[] = [];
  for (let i = 0; i < labs.length; i++) {
    if (i !== without && means[i] === average) found.push(labs[i]);
  }
  return found;
}

function listLabs(labs: readonly string[]): string {
  return labs.length <= 1 ? (labs[0] ?? "") : `${labs.slice(0, -1).join(", ")} and ${labs[labs.length - 1]}`;
}

export interface ScreeningInput {
  labs: readonly string[];
  /** cell averages, in the order of `labs` */
  means: readonly number[];
  /** cell variances, in the order of `labs` */
  variances: readonly number[];
  /** replicates per cell for Cochran's critical values (the most frequent count when unequal) */
  n: number;
}

export interface ScreeningOutcome {
  cochran: CochranResult;
  grubbs: GrubbsResult;
  steps: ScreeningStep[];
}

/**
 * ISO 5725-2 §7.3, Cochran's test on the cell variances. Uninformative when
 * every other cell shows no spread at all: C is then 1 whatever the one
 * spread is (whole-number results with identical replicates do this).
 */
export function screenCochran({ labs, variances, n }: ScreeningInput): CochranResult {
  const p = labs.length;
  const { C, index } = cochranC(variances);
  const critical5 = cochranCritical(p, n, 0.05);
  const critical1 = cochranCritical(p, n, 0.01);
  let uninformative: string | null = null;
  if (C !== null) {
    const largest = variances[index];
    const others = variances.reduce((sum, v) => sum + v, 0) - largest;
    if (others <= TIE_SHARE * largest) {
      uninformative = `only ${labs[index]} shows any spread between replicates (every other lab's replicates are identical), so C = 1 whatever that spread is; the test cannot judge it — k compares it with s_r instead`;
    }
  }
  return {
    C,
    critical5,
    critical1,
    class: uninformative === null ? outlierClass(C, critical5, critical1, "above") : null,
    lab: C === null ? null : labs[index],
    uninformative,
  };
}

/**
 * ISO 5725-2 §7.3.4, the single Grubbs test on one side. Uninformative when
 * two labs share the extreme average (the test cannot single one out; the
 * double test judges them as a pair) or when every other average is equal
 * (G then takes its largest possible value, (p − 1)/√p, however close the lab is).
 */
export function screenGrubbsSingle({ labs, means }: ScreeningInput, side: "high" | "low"): GrubbsSingleResult {
  const p = labs.length;
  const single = grubbsSingle(means)[side];
  const critical5 = grubbsSingleCritical(p, 0.05);
  const critical1 = grubbsSingleCritical(p, 0.01);
  const extreme = means[single.index];
  const tied = labsAveraging(labs, means, extreme);
  let uninformative: string | null = null;
  if (single.G !== null) {
    if (tied.length > 1) {
      uninformative = `${listLabs(tied)} share the ${side === "high" ? "highest" : "lowest"} average, so the single test cannot single one out`;
    } else if (sumOfSquares(means, single.index) <= TIE_SHARE * sumOfSquares(means)) {
      uninformative = `every other lab has the same average, so G = (p − 1)/√p = ${single.G.toFixed(3)}, its largest possible value, however close ${labs[single.index]} is; the test cannot judge it — h does`;
    }
  }
  return {
    G: single.G,
    lab: labs[single.index],
    critical5,
    critical1,
    class: uninformative === null ? outlierClass(single.G, critical5, critical1, "above") : null,
    uninformative,
  };
}

/**
 * ISO 5725-2 §7.3.4, the double Grubbs test on one side: the two most extreme
 * averages as a pair. Uninformative when the pair is not unique (the second
 * most extreme average is shared) or when the averages left after removing
 * the pair are all equal (the statistic is then 0 whatever the pair does).
 * Null when p is outside the tabulated 4 … 40.
 */
export function screenGrubbsDouble({ labs, means }: ScreeningInput, side: "high" | "low"): GrubbsDoubleResult | null {
  const p = labs.length;
  const critical = grubbsDoubleCritical(p);
  if (critical === null) return null;
  const double = grubbsDouble(means)[side];
  const [first, second] = double.indices;
  const pair: [string, string] = [labs[first], labs[second]];
  let uninformative: string | null = null;
  if (double.G !== null) {
    const sharing = labsAveraging(labs, means, means[second], first);
    if (sharing.length > 1) {
      uninformative = `${listLabs(sharing)} share the ${side === "high" ? "second highest" : "second lowest"} average, so no single pair is the most extreme`;
    } else if (sumOfSquares(means, first, second) <= TIE_SHARE * sumOfSquares(means)) {
      uninformative = `the other ${p - 2} labs all have the same average, so the statistic is 0 however close ${pair[0]} and ${pair[1]} are; the test cannot judge them`;
    }
  }
  return {
    G: double.G,
    labs: pair,
    critical5: critical.critical5,
    critical1: critical.critical1,
    class: uninformative === null ? outlierClass(double.G, critical.critical5, critical.critical1, "below") : null,
    uninformative,
  };
}

function outcome(cls: ScreeningStep["class"], uninformative: string | null): Pick<ScreeningStep, "outcome" | "reason"> {
  if (uninformative !== null) return { outcome: "uninformative", reason: uninformative };
  return { outcome: cls === null ? "passed" : "flagged", reason: null };
}

/**
 * ISO 5725-2 §7.3, the screening procedure in its order: Cochran's test on the
 * cell spreads; the single Grubbs test on the highest and on the lowest cell
 * average; the double Grubbs test on a side only when the single test there
 * found nothing (no straggler or outlier), and only on the two most extreme
 * averages of that side. Flags start an investigation; nothing is removed.
 */
export function screenCells(input: ScreeningInput): ScreeningOutcome {
  const p = input.labs.length;
  const steps: ScreeningStep[] = [];
  const cochran = screenCochran(input);
  steps.push({
    test: "cochran",
    side: null,
    labs: cochran.lab === null ? [] : [cochran.lab],
    statistic: cochran.C,
    critical5: cochran.critical5,
    critical1: cochran.critical1,
    class: cochran.class,
    ...(cochran.C === null ? { outcome: "uninformative" as const, reason: "no lab shows any spread between replicates" } : outcome(cochran.class, cochran.uninformative)),
  });
  const single = { high: screenGrubbsSingle(input, "high"), low: screenGrubbsSingle(input, "low") };
  const doubles: { high: GrubbsDoubleResult | null; low: GrubbsDoubleResult | null } = { high: null, low: null };
  for (const side of ["high", "low"] as const) {
    const s = single[side];
    steps.push({
      test: "grubbs-single",
      side,
      labs: [s.lab],
      statistic: s.G,
      critical5: s.critical5,
      critical1: s.critical1,
      class: s.class,
      ...(s.G === null ? { outcome: "uninformative" as const, reason: "all cell averages are equal" } : outcome(s.class, s.uninformative)),
    });
  }
  for (const side of ["high", "low"] as const) {
    const s = single[side];
    const notRun = (reason: string) =>
      steps.push({ test: "grubbs-double", side, labs: [], statistic: null, critical5: null, critical1: null, class: null, outcome: "not-run", reason });
    if (s.class !== null) {
      notRun(`the single test on the ${side} side already found ${s.lab} (${s.class}); ISO 5725-2 runs the double test only where the single test finds nothing`);
      continue;
    }
    if (p < GRUBBS_DOUBLE_MIN_LABS || p > GRUBBS_DOUBLE_MAX_LABS) {
      notRun(`the double test is tabulated for ${GRUBBS_DOUBLE_MIN_LABS} to ${GRUBBS_DOUBLE_MAX_LABS} labs; this group has ${p}`);
      continue;
    }
    const d = screenGrubbsDouble(input, side);
    doubles[side] = d;
    if (d === null) {
      notRun(`no critical value of the double test is available for ${p} labs`);
      continue;
    }
    steps.push({
      test: "grubbs-double",
      side,
      labs: [...d.labs],
      statistic: d.G,
      critical5: d.critical5,
      critical1: d.critical1,
      class: d.class,
      ...(d.G === null ? { outcome: "uninformative" as const, reason: "all cell averages are equal" } : outcome(d.class, d.uninformative)),
    });
  }
  return {
    cochran,
    grubbs: { high: single.high, low: single.low, doubleHigh: doubles.high, doubleLow: doubles.low },
    steps,
  };
}
