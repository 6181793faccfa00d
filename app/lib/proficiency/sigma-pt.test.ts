import { describe, expect, it } from "vitest";
import { sigmaPtFromPrecision } from "./sigma-pt";

describe("sigmaPtFromPrecision (ISO 13528 8.5: σ_pt = √(σ_R² − σ_r²(1 − 1/m)))", () => {
  it("is σ_R for single results", () => {
    expect(sigmaPtFromPrecision(2, 1, 1)).toBe(2);
  });
  it("removes the share of repeatability that averaging m replicates takes away", () => {
    // √(4 − 1·(1 − 1/2)) = √3.5
    expect(sigmaPtFromPrecision(2, 1, 2)).toBeCloseTo(Math.sqrt(3.5), 12);
    // √(9 − 4·(1 − 1/3)) = √(19/3)
    expect(sigmaPtFromPrecision(3, 2, 3)).toBeCloseTo(Math.sqrt(19 / 3), 12);
  });
  it("refuses inconsistent figures and bad replicate counts", () => {
    expect(() => sigmaPtFromPrecision(1, 3, 2)).toThrow(/inconsistent/);
    expect(() => sigmaPtFromPrecision(1, 0.5, 0)).toThrow(RangeError);
    expect(() => sigmaPtFromPrecision(1, 0.5, 1.5)).toThrow(RangeError);
  });
});
