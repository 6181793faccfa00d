import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { fQuantile, studentTQuantile } from "./distributions";

// Reference quantiles computed independently with SciPy (tests/fixtures/precision-scipy-reference.py).
const reference = JSON.parse(
  readFileSync(new URL("../../../tests/fixtures/precision-scipy-reference.json", import.meta.url), "utf8"),
) as {
  studentT: { probability: number; df: number; quantile: number }[];
  F: { probability: number; df1: number; df2: number; quantile: number }[];
};

describe("studentTQuantile", () => {
  it.each(reference.studentT)("t($probability, $df) agrees with SciPy's t.ppf", ({ probability, df, quantile }) => {
    expect(studentTQuantile(probability, df)).toBeCloseTo(quantile, 6);
    expect(Math.abs(studentTQuantile(probability, df) / quantile - 1)).toBeLessThan(1e-8);
  });

  it("rejects probabilities outside (0, 1) and non-positive degrees of freedom", () => {
    expect(() => studentTQuantile(1, 3)).toThrow(RangeError);
    expect(() => studentTQuantile(0.5, 0)).toThrow(RangeError);
  });
});

describe("fQuantile", () => {
  it.each(reference.F)("F($probability; $df1, $df2) agrees with SciPy's f.ppf", ({ probability, df1, df2, quantile }) => {
    expect(Math.abs(fQuantile(probability, df1, df2) / quantile - 1)).toBeLessThan(1e-8);
  });

  it("rejects invalid degrees of freedom", () => {
    expect(() => fQuantile(0.99, 1, Number.NaN)).toThrow(RangeError);
  });
});
