import { studentTQuantile } from "./distributions";
import { memoize } from "./memoize";

function meanAndSumOfSquares(values: readonly number[]): { mean: number; sumSquares: number } {
  let sum = 0;
  for (const value of values) sum += value;
  const mean = sum / values.length;
  let sumSquares = 0;
  for (const value of values) sumSquares += (value - mean) ** 2;
  return { mean, sumSquares };
}

export interface GrubbsSingleStatistic {
  /** G, null when all values are equal */
  G: number | null;
  /** index of the tested value */
  index: number;
}

/**
 * ISO 5725-2, Grubbs' single-outlier statistics over p values (the cell averages):
 * G_high = (x_max − x̄)/s and G_low = (x̄ − x_min)/s, s with the p − 1 divisor.
 */
export function grubbsSingle(values: readonly number[]): {
  high: GrubbsSingleStatistic;
  low: GrubbsSingleStatistic;
} {
  const p = values.length;
  if (p < 3) throw new RangeError(`Grubbs' test needs at least 3 values, got ${p}`);
  const { mean, sumSquares } = meanAndSumOfSquares(values);
  const s = Math.sqrt(sumSquares / (p - 1));
  let highIndex = 0;
  let lowIndex = 0;
  for (let i = 1; i < p; i++) {
    if (values[i] > values[highIndex]) highIndex = i;
    if (values[i] < values[lowIndex]) lowIndex = i;
  }
  return {
    high: { G: s === 0 ? null : (values[highIndex] - mean) / s, index: highIndex },
    low: { G: s === 0 ? null : (mean - values[lowIndex]) / s, index: lowIndex },
  };
}

/**
 * ISO 5725-2, critical value of the single Grubbs test at level α (two-sided):
 * G = ((p − 1)/√p)·√(t²/(p − 2 + t²)), t the Student's t quantile at 1 − α/(2p)
 * with p − 2 df.
 */
export const grubbsSingleCritical = memoize((p: number, alpha: number): number => {
  if (!Number.isInteger(p) || p < 3) throw new RangeError(`Grubbs' test needs at least 3 values, got ${p}`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`α must lie between 0 and 1, got ${alpha}`);
  const t = studentTQuantile(1 - alpha / (2 * p), p - 2);
  return ((p - 1) / Math.sqrt(p)) * Math.sqrt((t * t) / (p - 2 + t * t));
});

export interface GrubbsDoubleStatistic {
  /** G = remaining sum of squares / total sum of squares; null when all values are equal */
  G: number | null;
  /** indices of the two tested values, most extreme first */
  indices: [number, number];
}

/**
 * ISO 5725-2, Grubbs' double-outlier statistics over p ≥ 4 values: the sum of
 * squared deviations left after removing the two highest (or two lowest)
 * values, each set about its own mean, divided by that of all p values.
 */
export function grubbsDouble(values: readonly number[]): {
  high: GrubbsDoubleStatistic;
  low: GrubbsDoubleStatistic;
} {
  const p = values.length;
  if (p < 4) throw new RangeError(`the double Grubbs test needs at least 4 values, got ${p}`);
  const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
  const total = meanAndSumOfSquares(values).sumSquares;
  const ratio = (kept: number[]): number | null =>
    total === 0 ? null : meanAndSumOfSquares(kept.map((i) => values[i])).sumSquares / total;
  return {
    high: { G: ratio(order.slice(0, p - 2)), indices: [order[p - 1], order[p - 2]] },
    low: { G: ratio(order.slice(2)), indices: [order[0], order[1]] },
  };
}
