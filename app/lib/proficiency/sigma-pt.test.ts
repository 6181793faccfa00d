import { describe, expect, it } from "vitest";
import { precisionAtLevel, sigmaPtFromPrecision } from "./sigma-pt";

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

describe("precisionAtLevel", () => {
  it("evaluates the fitted relations at the round's level", () => {
    const figures = precisionAtLevel(
      {
        basis: "level-relation",
        repeatability: { relation: "proportional", formula: "s = b·m", b: 0.05 },
        reproducibility: { relation: "linear", formula: "s = a + b·m", a: 0.5, b: 0.1 },
      },
      20,
    );
    expect(figures.sr).toBeCloseTo(1, 12);
    expect(figures.sR).toBeCloseTo(2.5, 12);
  });
  it("passes a single material's figures through", () => {
    expect(precisionAtLevel({ basis: "material", sr: 1, sR: 2 }, 99)).toEqual({ sr: 1, sR: 2 });
  });
});
