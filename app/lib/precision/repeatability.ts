/** ASTM E691, repeatability standard deviation for equal replicates: s_r = √(Σ s_i² / p). */
export function repeatabilityStandardDeviation(cellSds: readonly number[]): number {
  if (cellSds.length === 0) throw new RangeError("need at least one cell standard deviation");
  let sumSquares = 0;
  for (const sd of cellSds) sumSquares += sd * sd;
  return Math.sqrt(sumSquares / cellSds.length);
}

/**
 * ISO 5725-2, repeatability for unequal replicates, the pooled within-cell
 * variance: s_r² = Σ(n_i − 1)s_i² / Σ(n_i − 1).
 */
export function pooledRepeatabilityStandardDeviation(
  cells: readonly { n: number; variance: number }[],
): number {
  let weighted = 0;
  let degreesOfFreedom = 0;
  for (const cell of cells) {
    weighted += (cell.n - 1) * cell.variance;
    degreesOfFreedom += cell.n - 1;
  }
  if (degreesOfFreedom === 0) throw new RangeError("need a cell with at least two results");
  return Math.sqrt(weighted / degreesOfFreedom);
}
