import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { chiSquareQuantile, fQuantile, studentTQuantile } from "./distributions";

// Reference quantiles computed independently with SciPy (tests/fixtures/precision-scipy-reference.py).
const reference = JSON.parse(
  readFileSync(new URL("../../../tests/fixtures/precision-scipy-reference.json", import.meta.url), "utf8"),
) as {
  studentT: { probability: number; df: number; quantile: number }[];
  F: { probability: number; df1: number; df2: number; quantile: number }[];
  chiSquare: { probability: number; df: number; quantile: number }[];
};

// The inversions reach 1e-12 relative (jStat alone stopped near 1e-9).
const RELATIVE = 1e-12;

describe("studentTQuantile", () => {
  it.each(reference.studentT)("t($probability, $df) agrees with SciPy's t.ppf", ({ probability, df, quantile }) => {
    expect(studentTQuantile(probability, df)).toBeCloseTo(quantile, 6);
    expect(Math.abs(studentTQuantile(probability, df) / quantile - 1)).toBeLessThan(RELATIVE);
  });

  it("rejects probabilities outside (0, 1) and non-positive degrees of freedom", () => {
    expect(() => studentTQuantile(1, 3)).toThrow(RangeError);
    expect(() => studentTQuantile(0.5, 0)).toThrow(RangeError);
  });
});

describe("fQuantile", () => {
  it.each(reference.F)("F($probability; $df1, $df2) agrees with SciPy's f.ppf", ({ probability, df1, df2, quantile }) => {
    expect(Math.abs(fQuantile(probability, df1, df2) / quantile - 1)).toBeLessThan(RELATIVE);
  });

  it("rejects invalid degrees of freedom", () => {
    expect(() => fQuantile(0.99, 1, Number.NaN)).toThrow(RangeError);
  });
});

describe("chiSquareQuantile", () => {
  it.each(reference.chiSquare)("χ²($probability, $df) agrees with SciPy's chi2.ppf", ({ probability, df, quantile }) => {
    expect(Math.abs(chiSquareQuantile(probability, df) / quantile - 1)).toBeLessThan(RELATIVE);
  });

  it("is symmetric in its use of the tails: lower tail of t is the negative upper", () => {
    expect(studentTQuantile(0.005, 8)).toBe(-studentTQuantile(0.995, 8));
  });
});
