import { describe, expect, it } from "vitest";
import { acceptabilityCheck } from "./acceptability";

describe("acceptabilityCheck", () => {
  it("accepts two results within r = 2.8·σ_r and reports their mean (ISO 5725-6, clause 5)", () => {
    const check = acceptabilityCheck([12, 14], 1);
    expect(check).toMatchObject({ n: 2, range: 2, acceptable: true, finalResultKind: "mean" });
    expect(check.criticalRange).toBeCloseTo(2.8, 12);
    expect(check.finalResult).toBe(13);
  });

  it("refuses two results further apart than r", () => {
    expect(acceptabilityCheck([12, 15], 1).acceptable).toBe(false);
  });

  it("uses f(4) = 3.6 for four results and reports their median when still too spread", () => {
    const check = acceptabilityCheck([10, 11, 12, 14], 1);
    expect(check.criticalRange).toBeCloseTo(3.6, 12);
    expect(check).toMatchObject({ range: 4, acceptable: false, finalResultKind: "median", finalResult: 11.5 });
  });

  it("needs at least two results", () => {
    expect(() => acceptabilityCheck([12], 1)).toThrow(RangeError);
  });
});
