import { memoize } from "./memoize";
import { seededUniform } from "./seeded-uniform";

/** ISO 5725-2 tabulates the double Grubbs test from 4 to 40 labs; simulation covers the same range. */
export const GRUBBS_DOUBLE_MIN_LABS = 4;
export const GRUBBS_DOUBLE_MAX_LABS = 40;
const SIMULATED_SAMPLES = 100_000;

/** Marsaglia's polar method: normal pairs without trigonometric calls. */
function fillStandardNormal(target: Float64Array, uniform: () => number): void {
  for (let i = 0; i < target.length; i += 2) {
    let u: number;
    let v: number;
    let radiusSquared: number;
    do {
      u = 2 * uniform() - 1;
      v = 2 * uniform() - 1;
      radiusSquared = u * u + v * v;
    } while (radiusSquared >= 1 || radiusSquared === 0);
    const scale = Math.sqrt((-2 * Math.log(radiusSquared)) / radiusSquared);
    target[i] = u * scale;
    if (i + 1 < target.length) target[i + 1] = v * scale;
  }
}

/**
 * The pair's share of the sum of squares: after removing values a and b from p
 * values with mean m and sum of squares S, the rest (mean m′) keeps
 * S − (a − m)² − (b − m)² − (p − 2)(m′ − m)².
 */
function remainingShare(p: number, mean: number, total: number, a: number, b: number): number {
  const keptMean = (p * mean - a - b) / (p - 2);
  const kept = total - (a - mean) ** 2 - (b - mean) ** 2 - (p - 2) * (keptMean - mean) ** 2;
  return Math.max(0, kept) / total;
}

/**
 * ISO 5725-2, lower critical values of the double Grubbs test at 5 % and 1 %.
 * The statistic's distribution has no closed form (the printed tables come
 * from numerical work), so it is simulated: 100 000 normal samples of size p,
 * each giving the two-highest and the two-lowest statistic (same distribution).
 * The test is two-sided like the single test, so the α critical value is the
 * α/2 quantile of one side. Null outside 4 ≤ p ≤ 40.
 */
export const grubbsDoubleCritical = memoize(
  (p: number): { critical5: number; critical1: number } | null => {
    if (!Number.isInteger(p) || p < GRUBBS_DOUBLE_MIN_LABS || p > GRUBBS_DOUBLE_MAX_LABS) return null;
    const uniform = seededUniform(0x5eed + p);
    const sample = new Float64Array(p);
    const statistics = new Float64Array(2 * SIMULATED_SAMPLES);
    for (let s = 0; s < SIMULATED_SAMPLES; s++) {
      fillStandardNormal(sample, uniform);
      let sum = 0;
      let high1 = -Infinity;
      let high2 = -Infinity;
      let low1 = Infinity;
      let low2 = Infinity;
      for (const x of sample) {
        sum += x;
        if (x > high1) {
          high2 = high1;
          high1 = x;
        } else if (x > high2) high2 = x;
        if (x < low1) {
          low2 = low1;
          low1 = x;
        } else if (x < low2) low2 = x;
      }
      const mean = sum / p;
      let total = 0;
      for (const x of sample) total += (x - mean) ** 2;
      statistics[2 * s] = remainingShare(p, mean, total, high1, high2);
      statistics[2 * s + 1] = remainingShare(p, mean, total, low1, low2);
    }
    statistics.sort();
    const quantile = (probability: number) =>
      statistics[Math.ceil(probability * statistics.length) - 1];
    return { critical5: quantile(0.05 / 2), critical1: quantile(0.01 / 2) };
  },
);
