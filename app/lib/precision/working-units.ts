/**
 * The working units of one group: origin = the midrange of its results,
 * scale = the power of two at or below the largest |x − origin| (1 when all
 * results are equal). Statistics computed on (x − origin)/scale keep the digits
 * a large common offset would cost (1e9 + small differences: x − origin is exact
 * for values within a factor 2 of each other) and never underflow or overflow
 * when squared (1e-200 gives a spread, not "no spread"); dividing by a power
 * of two is exact, so nothing is lost going back.
 */
export function workingUnits(values: ArrayLike<number>, ranges: readonly { start: number; count: number }[]): { origin: number; scale: number } {
  let min = Number.POSITIVE_INFINITY;
  let max = Number.NEGATIVE_INFINITY;
  for (const { start, count } of ranges) {
    for (let i = start; i < start + count; i++) {
      if (values[i] < min) min = values[i];
      if (values[i] > max) max = values[i];
    }
  }
  if (!(min <= max)) return { origin: 0, scale: 1 };
  const origin = min / 2 + max / 2;
  const largest = Math.max(max - origin, origin - min);
  const scale = largest > 0 && Number.isFinite(largest) ? 2 ** Math.floor(Math.log2(largest)) : 1;
  return { origin, scale };
}
