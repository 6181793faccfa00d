import { describe, expect, it } from "vitest";
import { pooledRepeatabilityStandardDeviation, repeatabilityStandardDeviation } from "./repeatability";

describe("repeatability", () => {
  it("ASTM E691: s_r = √(Σ s_i² / p); by hand, s = 1, 2, 2 gives √3", () => {
    expect(repeatabilityStandardDeviation([1, 2, 2])).toBeCloseTo(Math.sqrt(3), 14);
  });

  it("ISO 5725-2: pooled over n_i − 1; by hand, (1·1 + 2·4 + 3·4)/6 = 21/6", () => {
    const cells = [
      { n: 2, variance: 1 },
      { n: 3, variance: 4 },
      { n: 4, variance: 4 },
    ];
    expect(pooledRepeatabilityStandardDeviation(cells)).toBeCloseTo(Math.sqrt(21 / 6), 14);
  });

  it("needs cells with spread to pool", () => {
    expect(() => repeatabilityStandardDeviation([])).toThrow(RangeError);
    expect(() => pooledRepeatabilityStandardDeviation([{ n: 1, variance: 0 }])).toThrow(RangeError);
  });
});
