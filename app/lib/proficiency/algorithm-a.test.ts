import { describe, expect, it } from "vitest";
import { algorithmA } from "./algorithm-a";

/**
 * An implementation written separately from ISO 13528:2022 Annex C.3.1, step by
 * step as the standard describes it (sorted data, explicit sums, a fixed number
 * of passes), to check the product's code against.
 */
function algorithmAFromTheStandard(data: number[]): { mean: number; sd: number } {
  const x = [...data].sort((a, b) => a - b);
  const p = x.length;
  const medianOf = (sorted: number[]) =>
    sorted.length % 2 ? sorted[(sorted.length - 1) / 2] : (sorted[sorted.length / 2 - 1] + sorted[sorted.length / 2]) / 2;
  let xStar = medianOf(x);
  let sStar = 1.483 * medianOf(x.map((v) => Math.abs(v - xStar)).sort((a, b) => a - b));
  for (let pass = 0; pass < 500; pass++) {
    const delta = 1.5 * sStar;
    const modified = x.map((v) => (v < xStar - delta ? xStar - delta : v > xStar + delta ? xStar + delta : v));
    let total = 0;
    for (const v of modified) total += v;
    xStar = total / p;
    let squares = 0;
    for (const v of modified) squares += (v - xStar) * (v - xStar);
    sStar = 1.134 * Math.sqrt(squares / (p - 1));
  }
  return { mean: xStar, sd: sStar };
}

// Cell averages of the worked example of ISO 5725-5:1998 (the robust analysis
// example that ISO 13528's Annex C reproduces the algorithm from).
const ISO_5725_5_EXAMPLE = [24.14, 20.155, 19.5, 20.3, 20.705, 17.57, 20.1, 20.94, 21.185];

// Fictional slump results (mm) of 12 labs with one gross outlier.
const SLUMP_WITH_OUTLIER = [95, 102, 98, 110, 100, 97, 104, 99, 101, 150, 96, 103];

describe("algorithmA (ISO 13528 Annex C.3.1)", () => {
  it("matches a reference computation in R for the ISO 5725-5 example data", () => {
    // Reference values computed once with R 4.2.2, base R only, Algorithm A as
    // written in ISO 13528 C.3.1 iterated to a change below 1e-12·s*:
    //   algA <- function(x) { m <- median(x); s <- 1.483*median(abs(x-m)); for (i in 1:1000) {
    //     d <- 1.5*s; w <- pmin(pmax(x, m-d), m+d); m1 <- mean(w); s1 <- 1.134*sd(w);
    //     if (abs(m1-m)<=1e-12*s && abs(s1-s)<=1e-12*s) {m<-m1;s<-s1;break}; m<-m1; s<-s1 }; c(m, s) }
    //   algA(c(24.140, 20.155, 19.500, 20.300, 20.705, 17.570, 20.100, 20.940, 21.185))
    //   → 20.41214285714  1.06983970295
    const estimate = algorithmA(ISO_5725_5_EXAMPLE);
    expect(estimate.robustMean).toBeCloseTo(20.41214285714, 9);
    expect(estimate.robustSd).toBeCloseTo(1.06983970295, 9);
    expect(estimate.count).toBe(9);
    expect(estimate.degenerate).toBe(false);
  });

  it("matches a reference computation in R for slump results with a gross outlier", () => {
    // Same R function as above: algA(c(95,102,98,110,100,97,104,99,101,150,96,103))
    //   → 101.03433787260  5.11445957535
    const estimate = algorithmA(SLUMP_WITH_OUTLIER);
    expect(estimate.robustMean).toBeCloseTo(101.0343378726, 8);
    expect(estimate.robustSd).toBeCloseTo(5.11445957535, 8);
  });

  it("agrees with an independent implementation written from the standard's text", () => {
    for (const data of [ISO_5725_5_EXAMPLE, SLUMP_WITH_OUTLIER, [11, 14, 12, 13, 25, 12, 13, 14, 3, 12]]) {
      const independent = algorithmAFromTheStandard(data);
      const estimate = algorithmA(data);
      expect(estimate.robustMean).toBeCloseTo(independent.mean, 9);
      expect(estimate.robustSd).toBeCloseTo(independent.sd, 9);
    }
  });

  it("agrees with Huber's proposal 2 in R's MASS package (hubers, k = 1.5) to the difference of their correction factors", () => {
    // MASS 7.3-58.2 (Venables & Ripley), R 4.2.2:
    //   library(MASS); hubers(x, k = 1.5, tol = 1e-12)
    // Proposal 2 winsorizes at 1.5 s like Algorithm A but corrects the scale by
    // 1/√β = 1.133392655462 (β = 0.778465216174 for k = 1.5) where ISO 13528
    // rounds the factor to 1.134, and starts from R's mad() (1.4826).
    //   ISO 5725-5 example → mu 20.41214285714, s 1.06776646627
    //   slump with outlier → mu 101.03210676657, s 5.10702926323
    const huber = [
      { data: ISO_5725_5_EXAMPLE, mu: 20.41214285714, s: 1.06776646627 },
      { data: SLUMP_WITH_OUTLIER, mu: 101.03210676657, s: 5.10702926323 },
    ];
    for (const { data, mu, s } of huber) {
      const estimate = algorithmA(data);
      expect(Math.abs(estimate.robustMean - mu)).toBeLessThan(0.001 * s);
      expect(Math.abs(estimate.robustSd / s - 1)).toBeLessThan(0.005);
    }
  });

  it("stops after one change when no result is winsorized (hand calculation)", () => {
    // 1..5: median 3, MAD 1, s* = 1.483, δ = 2.2245 clips nothing, so x* = 3
    // and s* = 1.134 · √2.5 from then on.
    const estimate = algorithmA([1, 2, 3, 4, 5]);
    expect(estimate.robustMean).toBe(3);
    expect(estimate.robustSd).toBeCloseTo(1.134 * Math.sqrt(2.5), 12);
  });

  it("resists the outlier where the plain mean does not", () => {
    const plainMean = SLUMP_WITH_OUTLIER.reduce((a, b) => a + b, 0) / SLUMP_WITH_OUTLIER.length;
    const estimate = algorithmA(SLUMP_WITH_OUTLIER);
    expect(plainMean - estimate.robustMean).toBeGreaterThan(3);
  });

  it("reports a degenerate set when more than half the results are equal", () => {
    const estimate = algorithmA([5, 5, 5, 5, 7]);
    expect(estimate).toMatchObject({ robustMean: 5, robustSd: 0, degenerate: true });
  });

  it("refuses fewer than two results and non-numbers", () => {
    expect(() => algorithmA([4])).toThrow(RangeError);
    expect(() => algorithmA([4, Number.NaN])).toThrow(RangeError);
  });
});
