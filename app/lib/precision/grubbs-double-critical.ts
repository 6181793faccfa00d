import precomputed from "./grubbs-double-table.json";

/** ISO 5725-2 tabulates the double Grubbs test from 4 labs; the precomputation below extends it to 40. */
export const GRUBBS_DOUBLE_MIN_LABS = 4;
export const GRUBBS_DOUBLE_MAX_LABS = 40;

/**
 * ISO 5725-2, lower critical values of Grubbs' double test (two highest or two
 * lowest cell averages) at 1 % and 5 %, p = 4 … 20, as the practice prints
 * them (Table 5; typed in `reference/critical-values.md`, where they were
 * checked against a 1 000 000-sample simulation within ±0.0012).
 */
const PUBLISHED: Readonly<Record<number, readonly [critical1: number, critical5: number]>> = {
  4: [0.0, 0.0002],
  5: [0.0018, 0.009],
  6: [0.0116, 0.0349],
  7: [0.0308, 0.0708],
  8: [0.0563, 0.1101],
  9: [0.0851, 0.1492],
  10: [0.115, 0.1864],
  11: [0.1448, 0.2213],
  12: [0.1738, 0.2537],
  13: [0.2016, 0.2836],
  14: [0.228, 0.3112],
  15: [0.253, 0.3367],
  16: [0.2767, 0.3603],
  17: [0.299, 0.3822],
  18: [0.32, 0.4025],
  19: [0.3398, 0.4214],
  20: [0.3585, 0.4391],
};

/** The last p the printed table covers; above it the values come from `grubbs-double-table.json`. */
export const GRUBBS_DOUBLE_PUBLISHED_MAX_LABS = 20;

const SIMULATED = new Map(precomputed.rows.map((row) => [row.p, [row.critical1, row.critical5] as const]));

/**
 * ISO 5725-2, lower critical values of the double Grubbs test at 5 % and 1 %
 * (the statistic is suspect when below them). p = 4 … 20: the published
 * table. p = 21 … 40: a Monte Carlo precomputation precise to the fourth
 * decimal (standard error at most 0.0001), made once by
 * `scripts/grubbs-double-table.ts` with the seed it names and kept in
 * `grubbs-double-table.json`; it reproduces the published p = 19 and 20 values.
 * Null outside 4 ≤ p ≤ 40.
 */
export function grubbsDoubleCritical(p: number): { critical5: number; critical1: number; source: "published" | "precomputed" } | null {
  if (!Number.isInteger(p) || p < GRUBBS_DOUBLE_MIN_LABS || p > GRUBBS_DOUBLE_MAX_LABS) return null;
  const published = PUBLISHED[p];
  if (published !== undefined) return { critical1: published[0], critical5: published[1], source: "published" };
  const simulated = SIMULATED.get(p);
  if (simulated === undefined) return null;
  return { critical1: simulated[0], critical5: simulated[1], source: "precomputed" };
}
