import { describe, expect, it } from "vitest";
import { assertSignificanceLevel, consistencyTails, isSignificanceLevel } from "./significance";

describe("significance levels", () => {
  it("E691's 0.5 % uses the 0.995 quantiles; ISO 5725-2 reads h two-sided and k one-sided", () => {
    expect(consistencyTails(0.005)).toEqual({ h: 0.005, k: 0.005 });
    expect(consistencyTails(0.01)).toEqual({ h: 0.005, k: 0.01 });
    expect(consistencyTails(0.05)).toEqual({ h: 0.025, k: 0.05 });
  });

  it("accepts only the tabulated levels", () => {
    expect(isSignificanceLevel(0.01)).toBe(true);
    expect(isSignificanceLevel(0.1)).toBe(false);
    expect(isSignificanceLevel("0.05")).toBe(false);
    expect(() => assertSignificanceLevel(0.02)).toThrow(RangeError);
  });
});
