import { fQuantile, studentTQuantile } from "./distributions";
import { memoize } from "./memoize";
import { assertSignificanceLevel, consistencyTails } from "./significance";

/** ASTM E691, between-laboratory consistency h_i = d_i / s_x̄; null when s_x̄ = 0. */
export function hStatistic(deviation: number, sx: number): number | null {
  return sx === 0 ? null : deviation / sx;
}

/** ASTM E691, within-laboratory consistency k_i = s_i / s_r; null when s_r = 0. */
export function kStatistic(cellSd: number, sr: number): number | null {
  return sr === 0 ? null : cellSd / sr;
}

/**
 * ASTM E691 / ISO 5725-2, critical h for p labs:
 * h = (p − 1)·t / √(p·(t² + p − 2)), t the Student's t quantile with p − 2 df
 * (tail probability from `consistencyTails`).
 */
export const hCritical = memoize((p: number, alpha: number = 0.005): number => {
  if (!Number.isInteger(p) || p < 3) throw new RangeError(`h needs at least 3 labs, got ${p}`);
  const t = studentTQuantile(1 - consistencyTails(assertSignificanceLevel(alpha)).h, p - 2);
  return ((p - 1) * t) / Math.sqrt(p * (t * t + p - 2));
});

/**
 * ASTM E691 / ISO 5725-2, critical k for p labs with n replicates:
 * k = √(p / (1 + (p − 1)/F)), F the F quantile with (n − 1, (p − 1)(n − 1)) df.
 */
export const kCritical = memoize((p: number, n: number, alpha: number = 0.005): number => {
  if (!Number.isInteger(p) || p < 2) throw new RangeError(`k needs at least 2 labs, got ${p}`);
  if (!(n >= 2)) throw new RangeError(`k needs at least 2 replicates, got ${n}`);
  const f = fQuantile(1 - consistencyTails(assertSignificanceLevel(alpha)).k, n - 1, (p - 1) * (n - 1));
  return Math.sqrt(p / (1 + (p - 1) / f));
});
