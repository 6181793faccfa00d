import { seededUniform } from "~/lib/precision/seeded-uniform";

/**
 * The order in which to perform the runs, randomised so that drift over the
 * day (temperature, a tiring operator, a stiffening batch) does not line up
 * with any factor's column (ASTM E1169; common practice for any designed
 * experiment). A Fisher–Yates shuffle driven by the seed, so the same seed
 * always gives the same run sheet. Returns 1-based design row numbers.
 */
export function randomRunOrder(runs: number, seed: number): number[] {
  const order = Array.from({ length: runs }, (_, i) => i + 1);
  const uniform = seededUniform(seed);
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(uniform() * (i + 1));
    [order[i], order[j]] = [order[j]!, order[i]!];
  }
  return order;
}
