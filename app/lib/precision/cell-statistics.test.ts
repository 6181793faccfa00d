import { mean, sampleStandardDeviation } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { cellStatistics } from "./cell-statistics";

describe("cellStatistics", () => {
  it("agrees with simple-statistics' mean and sample standard deviation", () => {
    // Reference library: simple-statistics 7.12.1.
    const values = [23.1, 22.7, 24.05, 23.4, 22.95];
    const cell = cellStatistics(values);
    expect(cell.n).toBe(5);
    expect(cell.mean).toBeCloseTo(mean(values), 13);
    expect(cell.sd).toBeCloseTo(sampleStandardDeviation(values), 13);
    expect(cell.variance).toBeCloseTo(sampleStandardDeviation(values) ** 2, 13);
  });

  it("keeps its digits when the values share many leading digits", () => {
    // 1e9 + {1, 2, 3} has s = 1 exactly; Σx² − (Σx)²/n loses it in double precision.
    const cell = cellStatistics([1e9 + 1, 1e9 + 2, 1e9 + 3]);
    expect(cell.sd).toBe(1);
    const values = [1e9 + 1, 1e9 + 2, 1e9 + 3];
    const naive = values.reduce((s, x) => s + x * x, 0) - values.reduce((s, x) => s + x, 0) ** 2 / 3;
    expect(naive / 2).not.toBe(1);
  });

  it("gives no standard deviation for a single result and refuses an empty cell", () => {
    expect(cellStatistics([5])).toEqual({ n: 1, mean: 5, variance: null, sd: null });
    expect(() => cellStatistics([])).toThrow(RangeError);
  });

  it("gives zero spread for identical results", () => {
    expect(cellStatistics([7, 7, 7]).sd).toBe(0);
  });
});
