import { describe, expect, it } from "vitest";
import { c670Limits, coefficientOfVariation, precisionLimit } from "./limits";

describe("precisionLimit", () => {
  it("ASTM E691: r = 2.8 s_r (≈ 1.96·√2, common practice)", () => {
    expect(precisionLimit(0.5)).toBeCloseTo(1.4, 14);
    expect(Math.abs(precisionLimit(1) - 1.96 * Math.SQRT2)).toBeLessThan(0.03);
  });
});

describe("coefficientOfVariation", () => {
  it("is 100·s/|x̿| in percent, undefined at level 0", () => {
    expect(coefficientOfVariation(0.5, 25)).toBeCloseTo(2, 14);
    expect(coefficientOfVariation(0.5, -25)).toBeCloseTo(2, 14);
    expect(coefficientOfVariation(0.5, 0)).toBeNull();
  });
});

describe("c670Limits", () => {
  it("ASTM C670: d2s = 2√2·s ≈ 2.83 s, and the % forms scale the CV the same way", () => {
    const limits = c670Limits(0.4, 20);
    expect(limits.oneS).toBe(0.4);
    expect(limits.d2s).toBeCloseTo(0.4 * 2.828427, 6);
    expect(limits.oneSPercent).toBeCloseTo(2, 14);
    expect(limits.d2sPercent).toBeCloseTo(2 * 2.828427, 6);
  });

  it("has no % forms at level 0", () => {
    expect(c670Limits(0.4, 0)).toMatchObject({ oneSPercent: null, d2sPercent: null });
  });
});
