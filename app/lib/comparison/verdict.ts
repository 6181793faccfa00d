import { formatFixed } from "~/lib/format";
import type { AcceptabilityCheck } from "./acceptability";
import type { MixtureComparison } from "./compare-mixtures";

const one = (x: number) => formatFixed(x, 1);

/**
 * The comparison in plain words: the observed difference, the smallest
 * difference the test can tell apart in this setting, and the verdict.
 */
export function comparisonVerdict(comparison: MixtureComparison, unit: string): string {
  const { difference, criticalDifference, real, trial, reference, setting, precision } = comparison;
  const observed =
    difference === 0
      ? `${trial.label} and ${reference.label} gave the same average`
      : `${trial.label} took ${one(Math.abs(difference))} ${difference > 0 ? "more" : "fewer"} ${unit} on average than ${reference.label}`;
  const where = setting === "same-lab" ? "within one lab" : "between two labs";
  const limit = `the test cannot tell differences under ${one(criticalDifference)} ${unit} apart ${where}`;
  const finding = real ? "the difference is real" : "the difference is within the test's own scatter";
  const caution = precision.outsideStudiedRange
    ? ` Caution: the mixtures' level (${one(precision.level)}) lies outside the levels the study covered (${one(precision.studiedRange[0])} to ${one(precision.studiedRange[1])}), so the precision figures are extrapolated.`
    : "";
  return `${observed}; ${limit}: ${finding}.${caution}`;
}

/** The acceptability check in plain words. */
export function acceptabilityVerdict(check: AcceptabilityCheck, unit: string): string {
  const span = `The ${check.n} results span ${one(check.range)} ${unit}; the critical range for ${check.n} results is ${one(check.criticalRange)} ${unit}`;
  return check.acceptable
    ? `${span}: the results are acceptable and their mean, ${one(check.finalResult)} ${unit}, is the final result.`
    : `${span}: the results are not acceptable. Take further results under the same conditions; if the larger set is still too spread, report its median (here ${one(check.finalResult)} ${unit}) and look for the cause.`;
}
