/** Blind lab codes (`L01`, `L02`, …), drawn at random so the order of acceptance does not show. */
import { randomInt } from "node:crypto";

export function labCode(n: number) {
  return `L${String(n).padStart(2, "0")}`;
}

/**
 * A code not yet taken in the study, drawn uniformly from L01…L{pool}; the pool
 * grows past the taken codes so there is always a free one.
 */
export function drawLabCode(taken: ReadonlySet<string>, poolSize: number, pick: (max: number) => number = randomInt) {
  const pool = Math.max(poolSize, taken.size + 1);
  const free: string[] = [];
  for (let n = 1; n <= pool; n++) if (!taken.has(labCode(n))) free.push(labCode(n));
  return free[pick(free.length)]!;
}
