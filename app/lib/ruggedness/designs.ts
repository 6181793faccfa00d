export const RUN_COUNTS = [8, 12] as const;
export type RunCount = (typeof RUN_COUNTS)[number];
export type Level = 1 | -1;

/** First rows of the cyclic two-level designs in Plackett & Burman (1946), "The design of optimum multifactorial experiments", Biometrika 33. */
const GENERATORS: Record<RunCount, Level[]> = {
  8: [1, 1, 1, -1, 1, -1, -1],
  12: [1, 1, -1, 1, 1, 1, -1, -1, -1, 1, -1],
};

/**
 * ASTM E1169 (Plackett–Burman designs for ruggedness tests): the two-level
 * screening design of N = 8 or 12 runs for up to N − 1 factors. Each of the
 * first N − 1 rows is the generator row shifted one column to the right of the
 * row before; the last run has every factor low. Entry [run][column] is +1
 * for the high setting, −1 for the low one; columns not given to a factor
 * are the design's dummy columns.
 */
export function plackettBurmanDesign(runs: RunCount): Level[][] {
  const generator = GENERATORS[runs];
  const k = generator.length;
  const rows: Level[][] = [];
  for (let run = 0; run < k; run++) rows.push(generator.map((_, column) => generator[(column - run + k) % k]!));
  rows.push(generator.map(() => -1 as const));
  return rows;
}

/** How many factors a design of N runs can take: N − 1 (ASTM E1169). */
export function maxFactors(runs: RunCount): number {
  return runs - 1;
}

/** The smallest design that takes this many factors, leaving the rest of its columns as dummies. */
export function designFor(factorCount: number): RunCount | null {
  return RUN_COUNTS.find((runs) => factorCount <= maxFactors(runs)) ?? null;
}
