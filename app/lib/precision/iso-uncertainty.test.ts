import { describe, expect, it } from "vitest";
import { ISO_5725_TABLES } from "../../../tests/fixtures/reference-tables";
import { repeatabilityUncertainty, reproducibilityUncertainty } from "./iso-uncertainty";

// ISO 5725-1 check values from reference/critical-values.md (copied to tests/fixtures/iso-5725-tables.json).
const { Ar, AR } = ISO_5725_TABLES;

describe("ISO 5725-1 A_r and A_R", () => {
  it.each(Ar)("A_r(p = $p, n = $n) = $value", ({ p, n, value }) => {
    expect(repeatabilityUncertainty(p, n)).toBeCloseTo(value, 3);
  });

  // The reference's three-decimal check values hold within ±0.002 (its preamble); p = 20, n = 3, γ = 2
  // works out by hand as 1.96·√(2038/109440) = 0.26747, which the file rounds to 0.268.
  it.each(AR)("A_R(p = $p, n = $n, γ = $gamma) = $value", ({ p, n, gamma, value }) => {
    expect(Math.abs(reproducibilityUncertainty(p, n, gamma) - value)).toBeLessThanOrEqual(0.002);
  });

  it("A_R(20, 3, 2) by hand: numerator 20·10² + 2·19 = 2038, denominator 2·16·9·20·19 = 109440", () => {
    expect(reproducibilityUncertainty(20, 3, 2)).toBeCloseTo(1.96 * Math.sqrt(2038 / 109440), 14);
  });

  it("A_R tends to 1.96·√(1/(2(p − 1))) as γ grows", () => {
    expect(reproducibilityUncertainty(10, 3, 1000)).toBeCloseTo(1.96 * Math.sqrt(1 / 18), 5);
  });

  it("refuses γ below 1", () => {
    expect(() => reproducibilityUncertainty(10, 3, 0.9)).toThrow(RangeError);
  });
});
