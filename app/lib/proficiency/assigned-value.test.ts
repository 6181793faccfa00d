import { describe, expect, it } from "vitest";
import { assignedValueUncertaintyNegligible, consensusUncertainty } from "./assigned-value";

describe("consensusUncertainty (ISO 13528 7.7.3: u = 1.25·s*/√p)", () => {
  it("applies the formula", () => {
    // 1.25 · 4 / √16 = 1.25
    expect(consensusUncertainty(4, 16)).toBe(1.25);
    // ISO 5725-5 example data, s* = 1.06983970295 (R reference in algorithm-a.test.ts), p = 9
    expect(consensusUncertainty(1.06983970295, 9)).toBeCloseTo((1.25 * 1.06983970295) / 3, 12);
  });
  it("refuses an empty consensus", () => {
    expect(() => consensusUncertainty(1, 0)).toThrow(RangeError);
  });
});

describe("assignedValueUncertaintyNegligible (ISO 13528 9.2.1: u ≤ 0.3·σ_pt)", () => {
  it("holds at the limit and fails above it", () => {
    expect(assignedValueUncertaintyNegligible(0.3, 1)).toBe(true);
    expect(assignedValueUncertaintyNegligible(0.31, 1)).toBe(false);
  });
});
