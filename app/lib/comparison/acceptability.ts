import { criticalRangeFactor } from "./critical-range";

export interface AcceptabilityCheck {
  n: number;
  range: number;
  /** CR₀.₉₅(n) = f(n)·σ_r */
  criticalRange: number;
  acceptable: boolean;
  /** the mean when the results are acceptable, else their median */
  finalResult: number;
  finalResultKind: "mean" | "median";
}

function median(sorted: readonly number[]): number {
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

/**
 * ISO 5725-6, clause 5 (acceptability under repeatability conditions): n results obtained under repeatability conditions are
 * acceptable when their range does not exceed the critical range
 * CR₀.₉₅(n) = f(n)·σ_r; then their mean is the final result. Otherwise the
 * standard has further results taken and, when the range of the larger set
 * still exceeds its critical range, reports the median of that set.
 */
export function acceptabilityCheck(values: readonly number[], sr: number): AcceptabilityCheck {
  if (values.length < 2) throw new RangeError("the acceptability check needs at least 2 results");
  const sorted = [...values].sort((a, b) => a - b);
  const range = sorted[sorted.length - 1]! - sorted[0]!;
  const criticalRange = criticalRangeFactor(values.length) * sr;
  const acceptable = range <= criticalRange;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return { n: values.length, range, criticalRange, acceptable, finalResult: acceptable ? mean : median(sorted), finalResultKind: acceptable ? "mean" : "median" };
}
