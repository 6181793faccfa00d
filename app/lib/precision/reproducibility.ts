/** ASTM E691, between-laboratory variance s_L² = s_x̄² − s_r²/n (may come out negative). */
export function betweenLabVariance(sx: number, sr: number, n: number): number {
  return sx * sx - (sr * sr) / n;
}

/**
 * ISO 5725-2, between-cell variance for unequal replicates:
 * s_d² = Σ n_i (x̄_i − x̿)² / (p − 1), x̿ the replicate-weighted general mean.
 */
export function betweenCellVariance(
  cells: readonly { n: number; mean: number }[],
  generalMean: number,
): number {
  if (cells.length < 2) throw new RangeError("need at least two cells");
  let sum = 0;
  for (const cell of cells) sum += cell.n * (cell.mean - generalMean) ** 2;
  return sum / (cells.length - 1);
}

/** ISO 5725-2, between-laboratory variance for unequal replicates: s_L² = (s_d² − s_r²)/n̄. */
export function generalBetweenLabVariance(sd2: number, sr: number, nBar: number): number {
  return (sd2 - sr * sr) / nBar;
}

/** ASTM E691 / ISO 5725-2, s_L = √s_L², taken as 0 when the variance estimate is negative. */
export function betweenLabStandardDeviation(variance: number): number {
  return variance > 0 ? Math.sqrt(variance) : 0;
}

/** ASTM E691, reproducibility standard deviation s_R = √(s_L² + s_r²), never below s_r. */
export function reproducibilityStandardDeviation(sL: number, sr: number): number {
  return Math.max(sr, Math.sqrt(sL * sL + sr * sr));
}
