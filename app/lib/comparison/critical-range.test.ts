import { describe, expect, it } from "vitest";
import { criticalRangeFactor, normalRangeQuantile } from "./critical-range";

describe("normalRangeQuantile", () => {
  // Upper 5 % points of the studentized range with ν = ∞, as printed in the usual tables
  // (Harter 1960; the ν = ∞ row of the Tukey q tables in statistics textbooks), from memory.
  const TABLE: [n: number, q: number][] = [
    [2, 2.772],
    [3, 3.314],
    [4, 3.633],
    [5, 3.858],
    [6, 4.03],
    [8, 4.286],
    [10, 4.474],
  ];
  it.each(TABLE)("q(0.95; %i, ∞) matches the published studentized range table", (n, q) => {
    expect(normalRangeQuantile(0.95, n)).toBeCloseTo(q, 2);
  });

  it("for two results equals 1.96·√2, the range of two normal values (exact)", () => {
    expect(normalRangeQuantile(0.95, 2)).toBeCloseTo(1.959964 * Math.SQRT2, 4);
  });

  it("refuses fewer than 2 results", () => {
    expect(() => normalRangeQuantile(0.95, 1)).toThrow(RangeError);
  });
});

describe("criticalRangeFactor", () => {
  // ISO 5725-6, table of critical range factors f(n) (from memory).
  it.each([
    [2, 2.8],
    [3, 3.3],
    [4, 3.6],
    [5, 3.9],
    [6, 4.0],
    [7, 4.2],
    [8, 4.3],
    [9, 4.4],
    [10, 4.5],
  ])("f(%i) = %f as ISO 5725-6 tabulates it", (n, f) => {
    expect(criticalRangeFactor(n)).toBe(f);
  });
});
