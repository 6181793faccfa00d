import { median, sampleStandardDeviation } from "simple-statistics";

/** Result of Algorithm A on one set of participant results. */
export interface RobustEstimate {
  /** robust average x* */
  robustMean: number;
  /** robust standard deviation s* */
  robustSd: number;
  /** number of participants p */
  count: number;
  iterations: number;
  /**
   * True when more than half the results are equal, so the starting s* (from
   * the median absolute deviation) is zero and the iteration cannot start:
   * x* is then the median and s* is 0.
   */
  degenerate: boolean;
}

/** ISO 13528 Annex C factors: 1.483 makes the MAD consistent at the normal distribution; 1.134 corrects winsorizing at 1.5 s*. */
const MAD_FACTOR = 1.483;
const WINSOR_LIMIT = 1.5;
const WINSOR_CORRECTION = 1.134;
const MAX_ITERATIONS = 1000;

/**
 * Algorithm A, ISO 13528:2022 Annex C.3.1 (the same in ISO 13528:2015 C.3.1
 * and ISO 5725-5:1998): robust average x* and robust standard deviation s*.
 *
 * Start: x* = median(xᵢ), s* = 1.483 · median|xᵢ − x*|.
 * Repeat: δ = 1.5·s*; winsorize xᵢ to [x* − δ, x* + δ]; x* = mean of the
 * winsorized values; s* = 1.134 · their sample standard deviation.
 *
 * The standard stops once the third significant figure no longer changes; we
 * iterate until the change is below 1e-12·s*, which reaches the same figures
 * and makes the result independent of where the iteration stops.
 */
export function algorithmA(values: readonly number[]): RobustEstimate {
  if (values.length < 2) throw new RangeError("Algorithm A needs at least 2 results");
  if (values.some((value) => !Number.isFinite(value))) throw new RangeError("Algorithm A needs finite numbers");
  let robustMean = median([...values]);
  let robustSd = MAD_FACTOR * median(values.map((value) => Math.abs(value - robustMean)));
  if (robustSd === 0) {
    return { robustMean, robustSd: 0, count: values.length, iterations: 0, degenerate: true };
  }
  let iterations = 0;
  while (iterations < MAX_ITERATIONS) {
    iterations += 1;
    const delta = WINSOR_LIMIT * robustSd;
    const winsorized = values.map((value) => Math.min(Math.max(value, robustMean - delta), robustMean + delta));
    const nextMean = winsorized.reduce((sum, value) => sum + value, 0) / winsorized.length;
    const nextSd = WINSOR_CORRECTION * sampleStandardDeviation(winsorized);
    const settled = Math.abs(nextMean - robustMean) <= 1e-12 * robustSd && Math.abs(nextSd - robustSd) <= 1e-12 * robustSd;
    robustMean = nextMean;
    robustSd = nextSd;
    if (settled) break;
  }
  return { robustMean, robustSd, count: values.length, iterations, degenerate: false };
}
