import { describe, expect, it } from "vitest";
import { standardNormalCdf, standardNormalDensity, standardNormalQuantile } from "./normal-distribution";

describe("standard normal distribution", () => {
  it("matches the standard normal table (from memory): Φ(1.96) = 0.9750, φ(0) = 1/√(2π), Φ⁻¹(0.975) = 1.95996", () => {
    expect(standardNormalCdf(1.96)).toBeCloseTo(0.975, 4);
    expect(standardNormalDensity(0)).toBeCloseTo(1 / Math.sqrt(2 * Math.PI), 12);
    expect(standardNormalQuantile(0.975)).toBeCloseTo(1.959964, 5);
  });
});
