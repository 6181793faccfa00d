import { describe, expect, it } from "vitest";
import { grubbsDoubleCritical } from "./grubbs-double-critical";

// ISO 5725-2 table of the double Grubbs test (lower critical values), from memory: p, 1 %, 5 %.
// Not in the shared reference list; the tolerance covers both the simulation's spread
// (about ±0.001 between seeds) and a slip of memory in the last digit.
const ISO_DOUBLE_GRUBBS_TABLE: [number, number, number][] = [
  [4, 0.0, 0.0002],
  [5, 0.0018, 0.009],
  [6, 0.0116, 0.0349],
  [8, 0.0563, 0.1101],
  [10, 0.115, 0.1864],
  [12, 0.1738, 0.2537],
  [20, 0.3585, 0.4391],
];
const TOLERANCE = 0.003;

describe("grubbsDoubleCritical", () => {
  it.each(ISO_DOUBLE_GRUBBS_TABLE)("p = %i agrees with the ISO 5725-2 table (from memory)", (p, at1, at5) => {
    const critical = grubbsDoubleCritical(p);
    expect(critical).not.toBeNull();
    expect(Math.abs((critical?.critical1 ?? Number.NaN) - at1)).toBeLessThanOrEqual(TOLERANCE);
    expect(Math.abs((critical?.critical5 ?? Number.NaN) - at5)).toBeLessThanOrEqual(TOLERANCE);
  });

  it("the 1 % value lies below the 5 % value", () => {
    const critical = grubbsDoubleCritical(15);
    expect(critical?.critical1).toBeLessThan(critical?.critical5 ?? 0);
  });

  it("is only given for 4 to 40 labs", () => {
    expect(grubbsDoubleCritical(3)).toBeNull();
    expect(grubbsDoubleCritical(41)).toBeNull();
  });
});
