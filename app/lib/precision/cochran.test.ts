import { describe, expect, it } from "vitest";
import { cochranC, cochranCritical } from "./cochran";

// ISO 5725-2 Cochran's C table for equal replicates, from memory (as listed in the shared
// reference critical-values.md): three-decimal entries agree with the formula within ±0.002.
const THREE_DECIMALS = 0.002;
const ISO_COCHRAN_TABLE: [number, number, number, number, number][] = [
  // p, n = 2 at 1 %, n = 2 at 5 %, n = 3 at 1 %, n = 3 at 5 %
  [3, 0.993, 0.967, 0.942, 0.871],
  [4, 0.968, 0.906, 0.864, 0.768],
  [5, 0.928, 0.841, 0.788, 0.684],
  [6, 0.883, 0.781, 0.722, 0.616],
  [7, 0.838, 0.727, 0.664, 0.561],
  [8, 0.794, 0.68, 0.615, 0.516],
  [9, 0.754, 0.638, 0.573, 0.478],
  [10, 0.718, 0.602, 0.536, 0.445],
];

describe("cochranCritical", () => {
  it.each(ISO_COCHRAN_TABLE)("p = %i matches the ISO 5725-2 table (from memory)", (p, n2at1, n2at5, n3at1, n3at5) => {
    expect(Math.abs(cochranCritical(p, 2, 0.01) - n2at1)).toBeLessThanOrEqual(THREE_DECIMALS);
    expect(Math.abs(cochranCritical(p, 2, 0.05) - n2at5)).toBeLessThanOrEqual(THREE_DECIMALS);
    expect(Math.abs(cochranCritical(p, 3, 0.01) - n3at1)).toBeLessThanOrEqual(THREE_DECIMALS);
    expect(Math.abs(cochranCritical(p, 3, 0.05) - n3at5)).toBeLessThanOrEqual(THREE_DECIMALS);
  });

  it("refuses too few cells or replicates", () => {
    expect(() => cochranCritical(1, 3, 0.05)).toThrow(RangeError);
    expect(() => cochranCritical(4, 1, 0.05)).toThrow(RangeError);
  });
});

describe("cochranC", () => {
  it("ISO 5725-2: the largest variance over the sum of variances, with its cell", () => {
    expect(cochranC([1, 4, 2, 1])).toEqual({ C: 0.5, index: 1 });
  });

  it("is undefined when no cell varies", () => {
    expect(cochranC([0, 0, 0]).C).toBeNull();
  });
});
