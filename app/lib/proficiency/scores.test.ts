import { describe, expect, it } from "vitest";
import { zetaScore, zPrimeScore, zScore } from "./scores";

// Definitions of ISO 13528:2022 clauses 9.4 (z), 9.5 (z′) and 9.6 (ζ), checked
// with numbers worked by hand.
describe("scores", () => {
  it("z = (x − x_pt)/σ_pt", () => {
    expect(zScore(26, 20, 2)).toBe(3);
    expect(zScore(15, 20, 2)).toBe(-2.5);
  });
  it("z′ = (x − x_pt)/√(σ_pt² + u²)", () => {
    // 3-4-5 triangle: √(3² + 4²) = 5
    expect(zPrimeScore(30, 20, 3, 4)).toBe(2);
    // with u = 0 z′ equals z
    expect(zPrimeScore(26, 20, 2, 0)).toBe(zScore(26, 20, 2));
  });
  it("ζ = (x − x_pt)/√(u(x)² + u(x_pt)²)", () => {
    expect(zetaScore(30, 6, 20, 8)).toBe(1);
    expect(zetaScore(10, 0.6, 11.6, 0.8)).toBeCloseTo(-1.6, 12);
  });
  it("refuses a zero σ_pt or combined uncertainty", () => {
    expect(() => zScore(1, 1, 0)).toThrow(RangeError);
    expect(() => zPrimeScore(1, 1, 0, 0.1)).toThrow(RangeError);
    expect(() => zetaScore(1, 0, 1, 0)).toThrow(RangeError);
  });
});
