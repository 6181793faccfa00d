export interface CellStatistics {
  /** number of results in the cell */
  n: number;
  /** cell average x̄ */
  mean: number;
  /** cell variance s² (n − 1 divisor); null with fewer than 2 results */
  variance: number | null;
  /** cell standard deviation s; null with fewer than 2 results */
  sd: number | null;
}

/**
 * ASTM E691, cell statistics: the cell average x̄ = Σx/n and the cell standard
 * deviation s = √(Σ(x − x̄)²/(n − 1)).
 * Corrected two-pass: the deviations are summed after centring, and the small
 * term (Σ(x − x̄))²/n removes the rounding left in x̄. Never Σx² − (Σx)²/n,
 * which loses all digits when the values share leading digits.
 * `start` and `end` select a range, so cells laid out in one buffer need no copies.
 * `origin` and `scale` give the working units (x − origin)/scale the figures
 * come back in: a working origin near the data keeps the digits a large
 * common offset would take (1e9 + small differences), and a power-of-two
 * scale keeps tiny or huge values from underflowing or overflowing when squared.
 */
export function cellStatistics(
  values: ArrayLike<number>,
  start = 0,
  end = values.length,
  origin = 0,
  scale = 1,
): CellStatistics {
  const n = end - start;
  if (!(n > 0)) throw new RangeError("a cell needs at least one result");
  let sum = 0;
  for (let i = start; i < end; i++) sum += (values[i] - origin) / scale;
  const mean = sum / n;
  if (n < 2) return { n, mean, variance: null, sd: null };
  let sumDeviations = 0;
  let sumSquares = 0;
  for (let i = start; i < end; i++) {
    const deviation = (values[i] - origin) / scale - mean;
    sumDeviations += deviation;
    sumSquares += deviation * deviation;
  }
  const variance = Math.max(0, (sumSquares - (sumDeviations * sumDeviations) / n) / (n - 1));
  return { n, mean, variance, sd: Math.sqrt(variance) };
}
