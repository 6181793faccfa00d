import { describe, expect, it } from "vitest";
import { betweenCellVariance, betweenLabStandardDeviation, betweenLabVariance, generalBetweenLabVariance, reproducibilityStandardDeviation } from "./reproducibility";

describe("between-lab and reproducibility", () => {
  it("ASTM E691: s_L² = s_x̄² − s_r²/n; by hand, 0.5² − 0.6²/4 = 0.16", () => {
    expect(betweenLabVariance(0.5, 0.6, 4)).toBeCloseTo(0.16, 14);
  });

  it("ASTM E691: s_L is 0 when its variance estimate is negative, and s_R is then s_r", () => {
    expect(betweenLabStandardDeviation(-0.02)).toBe(0);
    expect(betweenLabStandardDeviation(0.16)).toBeCloseTo(0.4, 14);
    expect(reproducibilityStandardDeviation(0, 0.6)).toBe(0.6);
    expect(reproducibilityStandardDeviation(0.8, 0.6)).toBeCloseTo(1, 14);
  });

  it("ISO 5725-2: s_d² = Σ n_i (x̄_i − x̿)²/(p − 1) and s_L² = (s_d² − s_r²)/n̄", () => {
    // By hand: n = 2, 2, 4 with averages 9, 11, 10 about 10 give (2 + 2 + 0)/2 = 2.
    const sd2 = betweenCellVariance([{ n: 2, mean: 9 }, { n: 2, mean: 11 }, { n: 4, mean: 10 }], 10);
    expect(sd2).toBeCloseTo(2, 14);
    expect(generalBetweenLabVariance(sd2, 1, 2.5)).toBeCloseTo(0.4, 14);
  });
});
