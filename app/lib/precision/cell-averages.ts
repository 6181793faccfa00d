/** ASTM E691, average of the cell averages: x̿ = Σ x̄_i / p. */
export function averageOfCellAverages(cellMeans: readonly number[]): number {
  if (cellMeans.length === 0) throw new RangeError("need at least one cell average");
  let sum = 0;
  for (const mean of cellMeans) sum += mean;
  return sum / cellMeans.length;
}

/**
 * ASTM E691, standard deviation of the cell averages: s_x̄ = √(Σ d_i² / (p − 1)),
 * d_i = x̄_i − x̿. Centred before squaring.
 */
export function standardDeviationOfCellAverages(cellMeans: readonly number[]): number {
  const p = cellMeans.length;
  if (p < 2) throw new RangeError("need at least two cell averages");
  const grand = averageOfCellAverages(cellMeans);
  let sumSquares = 0;
  for (const mean of cellMeans) sumSquares += (mean - grand) ** 2;
  return Math.sqrt(sumSquares / (p - 1));
}

/** ISO 5725-2, general mean for unequal replicates: x̿ = Σ n_i x̄_i / Σ n_i. */
export function replicateWeightedMean(cells: readonly { n: number; mean: number }[]): number {
  let weighted = 0;
  let total = 0;
  for (const cell of cells) {
    weighted += cell.n * cell.mean;
    total += cell.n;
  }
  if (total === 0) throw new RangeError("need at least one result");
  return weighted / total;
}

/**
 * ISO 5725-2, effective replicates per cell: n̄ = (Σn_i − Σn_i²/Σn_i)/(p − 1).
 * Equal counts give that count exactly (also for a single cell).
 */
export function averageReplicates(counts: readonly number[]): number {
  const p = counts.length;
  if (p === 0) throw new RangeError("need at least one cell");
  if (counts.every((count) => count === counts[0])) return counts[0];
  let sum = 0;
  let sumSquares = 0;
  for (const count of counts) {
    sum += count;
    sumSquares += count * count;
  }
  return (sum - sumSquares / sum) / (p - 1);
}

/** The replicate count that occurs most often (the larger on a tie). */
export function mostFrequentReplicates(counts: readonly number[]): number {
  const frequency = new Map<number, number>();
  for (const count of counts) frequency.set(count, (frequency.get(count) ?? 0) + 1);
  let best = 0;
  let bestFrequency = 0;
  for (const [count, times] of frequency) {
    if (times > bestFrequency || (times === bestFrequency && count > best)) {
      best = count;
      bestFrequency = times;
    }
  }
  return best;
}
