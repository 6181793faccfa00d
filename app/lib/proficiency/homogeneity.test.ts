import { describe, expect, it } from "vitest";
import { homogeneityCheck, type DuplicatePair } from "./homogeneity";

// Fictional homogeneity data: 10 samples of one material, each tested twice.
const A = [12.1, 11.8, 12.4, 12.0, 11.9, 12.6, 12.2, 11.7, 12.3, 12.0];
const B = [12.3, 11.6, 12.5, 11.8, 12.2, 12.4, 12.0, 11.9, 12.1, 12.2];
const PAIRS: DuplicatePair[] = A.map((a, i) => [a, B[i]]);

describe("homogeneityCheck (ISO 13528 Annex B.3)", () => {
  it("gives the between-sample standard deviation of a one-way analysis of variance in R", () => {
    // ISO 13528 B.3's s_s equals √((MS_between − MS_within)/2) of a one-way
    // ANOVA with samples as groups. Reference computed once with R 4.2.2:
    //   d <- data.frame(y = c(a, b), s = factor(rep(1:10, 2)))
    //   t <- anova(lm(y ~ s, data = d))  # MS_between 0.132222222222, MS_within 0.021
    //   sqrt((msb - msw)/2) → 0.235820082078; sqrt(msw) → 0.144913767462; mean → 12.1
    const check = homogeneityCheck(PAIRS, 1);
    expect(check.ss).toBeCloseTo(0.235820082078, 10);
    expect(check.sw).toBeCloseTo(0.144913767462, 10);
    expect(check.generalMean).toBeCloseTo(12.1, 12);
    expect(check.samples).toBe(10);
  });

  it("compares s_s with 0.3·σ_pt (B.2.2)", () => {
    expect(homogeneityCheck(PAIRS, 1).passes).toBe(true); // 0.236 ≤ 0.3
    const failing = homogeneityCheck(PAIRS, 0.7); // 0.236 > 0.21
    expect(failing.criterion).toBeCloseTo(0.21, 12);
    expect(failing.passes).toBe(false);
  });

  it("sets s_s to zero when the within-sample spread explains all of it", () => {
    const check = homogeneityCheck(
      [
        [10, 12],
        [12, 10],
        [11, 11.2],
      ],
      1,
    );
    expect(check.ss).toBe(0);
  });

  it("refuses fewer than two samples", () => {
    expect(() => homogeneityCheck([[1, 2]], 1)).toThrow(RangeError);
  });
});
