import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { repeatabilityInterval, reproducibilityInterval, satterthwaiteDegreesOfFreedom, standardDeviationInterval } from "./confidence-intervals";

// Independent computation with SciPy (tests/fixtures/precision-scipy-intervals.py).
const reference = JSON.parse(readFileSync(new URL("../../../tests/fixtures/precision-scipy-intervals.json", import.meta.url), "utf8")) as {
  chiSquareIntervals: { s: number; df: number; lower: number; upper: number }[];
  satterthwaite: { p: number; n: number; sr: number; sx: number; sR: number; df: number; lower: number; upper: number }[];
};

describe("standardDeviationInterval (chi-square)", () => {
  it.each(reference.chiSquareIntervals)("s = 1, ν = $df agrees with SciPy", ({ s, df, lower, upper }) => {
    const interval = standardDeviationInterval(s, df);
    expect(interval.lower).toBeCloseTo(lower, 11);
    expect(interval.upper).toBeCloseTo(upper, 11);
  });

  it("s_r's interval uses p(n − 1) degrees of freedom and scales with s_r", () => {
    const interval = repeatabilityInterval(2, 8 * 2);
    expect(interval.df).toBe(16);
    expect(interval.lower).toBeLessThan(2);
    expect(interval.upper).toBeGreaterThan(2);
    expect(interval.method).toMatch(/chi-square, 16/);
  });
});

describe("reproducibilityInterval (Satterthwaite)", () => {
  it.each(reference.satterthwaite)("p = $p, n = $n, s_r = $sr, s_x̄ = $sx agrees with SciPy", ({ p, n, sr, sx, sR, df, lower, upper }) => {
    const interval = reproducibilityInterval({ sR, sr, sd2: n * sx * sx, nBar: n, p, dfr: p * (n - 1), sLClamped: false });
    expect(interval.df).toBeCloseTo(df, 10);
    expect(interval.lower).toBeCloseTo(lower, 10);
    expect(interval.upper).toBeCloseTo(upper, 10);
  });

  it("takes s_r's interval when s_L² came out negative (s_R = s_r)", () => {
    const interval = reproducibilityInterval({ sR: 1, sr: 1, sd2: 0.5, nBar: 3, p: 8, dfr: 16, sLClamped: true });
    expect(interval.df).toBe(16);
    expect(interval.lower).toBeCloseTo(repeatabilityInterval(1, 16).lower, 14);
  });

  it("Satterthwaite's ν of a single mean square is its own ν", () => {
    expect(satterthwaiteDegreesOfFreedom([{ value: 3, df: 7 }])).toBeCloseTo(7, 14);
  });
});
