import { describe, expect, it } from "vitest";
import { dummyColumnScatter, replicateScatter, testEffect } from "./significance";

describe("replicateScatter", () => {
  it("pools the within-run variances and gives SE = 2s/√(N·n) (worked by hand)", () => {
    // 4 runs in duplicate; within-run differences 2, 0, 2, 2: variances 2, 0, 2, 2, s² = 1.5 with 4 df.
    const scatter = replicateScatter([[10, 12], [11, 11], [9, 11], [13, 15]])!;
    expect(scatter.degreesOfFreedom).toBe(4);
    expect(scatter.standardError).toBeCloseTo((2 * Math.sqrt(1.5)) / Math.sqrt(8), 12);
    expect(scatter.basis).toBe("replicates");
  });

  it("is null with single results", () => {
    expect(replicateScatter([[10], [11], [12]])).toBeNull();
  });
});

describe("dummyColumnScatter", () => {
  it("is the root mean square of the dummy effects, one degree of freedom each (ASTM E1169)", () => {
    const scatter = dummyColumnScatter([0.3, -0.4])!;
    expect(scatter.standardError).toBeCloseTo(Math.sqrt((0.09 + 0.16) / 2), 12);
    expect(scatter.degreesOfFreedom).toBe(2);
    expect(dummyColumnScatter([])).toBeNull();
  });
});

describe("testEffect", () => {
  it("compares |effect|/SE with t(0.975, df): t(0.975, 4) = 2.776 from the t table (from memory)", () => {
    const scatter = { standardError: 1, degreesOfFreedom: 4, basis: "replicates" as const };
    expect(testEffect(2.7, scatter)).toMatchObject({ significant: false });
    expect(testEffect(-2.8, scatter)).toMatchObject({ significant: true });
    expect(testEffect(2.8, scatter).critical).toBeCloseTo(2.776, 3);
  });
});
