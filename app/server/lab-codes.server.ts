/**
 * Blind lab codes (`L01`…`L99`), drawn at random from a range much wider than
 * the number of labs, so neither the order of acceptance nor the number of
 * labs shows: an analyst's L07 says nothing about whether there are 7 labs or 40.
 */
import { randomInt } from "node:crypto";

/** Codes are drawn from L01…L99 while the study has up to 33 labs, then from three times the number of labs. */
export const LAB_CODE_RANGE = 99;

export function labCode(n: number) {
  return `L${String(n).padStart(2, "0")}`;
}

/** How many codes the draw picks from, for a study with `labCount` labs. */
export function labCodeRange(labCount: number) {
  return Math.max(LAB_CODE_RANGE, 3 * labCount);
}

/** A code not yet taken in the study, drawn uniformly from the free codes of L01…L{range}. */
export function drawLabCode(taken: ReadonlySet<string>, labCount: number, pick: (max: number) => number = randomInt) {
  const range = Math.max(labCodeRange(labCount), taken.size + 1);
  const free: string[] = [];
  for (let n = 1; n <= range; n++) if (!taken.has(labCode(n))) free.push(labCode(n));
  return free[pick(free.length)]!;
}
