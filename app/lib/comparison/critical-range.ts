import { standardNormalCdf, standardNormalDensity } from "~/lib/normal-distribution";

/** P(range of n standard normal values ≤ w) = n ∫ φ(z) [Φ(z + w) − Φ(z)]^(n−1) dz, by Simpson's rule on [−8, 8]. */
function normalRangeProbability(w: number, n: number): number {
  const steps = 800;
  const from = -8;
  const width = 16 / steps;
  let sum = 0;
  for (let i = 0; i <= steps; i++) {
    const z = from + i * width;
    const weight = i === 0 || i === steps ? 1 : i % 2 === 1 ? 4 : 2;
    sum += weight * standardNormalDensity(z) * (standardNormalCdf(z + w) - standardNormalCdf(z)) ** (n - 1);
  }
  return (n * sum * width) / 3;
}

/**
 * The p-quantile of the range of n independent results from one normal
 * distribution, in units of σ (the studentized range with infinite degrees of
 * freedom, q(p; n, ∞)). Found by bisection on the range's distribution.
 */
export function normalRangeQuantile(probability: number, n: number): number {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`a range needs at least 2 results, got ${n}`);
  let low = 0;
  let high = 12;
  for (let i = 0; i < 60; i++) {
    const middle = (low + high) / 2;
    if (normalRangeProbability(middle, n) < probability) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

/**
 * ISO 5725-6, clause 5 and its table of f(n): the critical range factor f(n), the 95 %
 * quantile of the range of n results in units of σ_r, given to one decimal
 * as the standard tabulates it (f(2) = 2.8, the factor of r = 2.8·σ_r).
 */
export function criticalRangeFactor(n: number): number {
  return Math.round(normalRangeQuantile(0.95, n) * 10) / 10;
}
