import { fQuantile } from "./distributions";
import { memoize } from "./memoize";

/**
 * ISO 5725-2, Cochran's statistic C = s²_max / Σ s_i² over the cell variances,
 * with the index of the largest. C is null when every variance is 0.
 */
export function cochranC(variances: readonly number[]): { C: number | null; index: number } {
  if (variances.length < 2) throw new RangeError("Cochran's test needs at least 2 cells");
  let index = 0;
  let total = 0;
  for (let i = 0; i < variances.length; i++) {
    total += variances[i];
    if (variances[i] > variances[index]) index = i;
  }
  return { C: total === 0 ? null : variances[index] / total, index };
}

/**
 * ISO 5725-2, critical Cochran's C for p cells of n replicates at level α:
 * C = 1 / (1 + (p − 1)/F), F the F quantile at 1 − α/p with (n − 1, (p − 1)(n − 1)) df.
 */
export const cochranCritical = memoize((p: number, n: number, alpha: number): number => {
  if (!Number.isInteger(p) || p < 2) throw new RangeError(`Cochran's test needs at least 2 cells, got ${p}`);
  if (!(n >= 2)) throw new RangeError(`Cochran's test needs at least 2 replicates, got ${n}`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`α must lie between 0 and 1, got ${alpha}`);
  const f = fQuantile(1 - alpha / p, n - 1, (p - 1) * (n - 1));
  return 1 / (1 + (p - 1) / f);
});
