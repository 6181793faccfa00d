import { describe, expect, it } from "vitest";
import { logGamma, regularizedBeta, regularizedGamma } from "./special-functions";

// Identities of the functions (Abramowitz & Stegun 6.1, 6.5, 26.5), from memory.
describe("logGamma", () => {
  it("matches Γ at integers and at ½", () => {
    expect(logGamma(10)).toBeCloseTo(Math.log(362880), 13);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    expect(logGamma(1)).toBeCloseTo(0, 14);
  });
});

describe("regularizedBeta", () => {
  it("is ½ at x = ½ for equal parameters, and its two tails add to 1", () => {
    expect(regularizedBeta(0.5, 3.5, 3.5).lower).toBeCloseTo(0.5, 15);
    const { lower, upper } = regularizedBeta(0.3, 2, 5);
    expect(lower + upper).toBeCloseTo(1, 15);
  });

  it("I_x(1, b) = 1 − (1 − x)^b", () => {
    expect(regularizedBeta(0.2, 1, 4).lower).toBeCloseTo(1 - 0.8 ** 4, 15);
  });
});

describe("regularizedGamma", () => {
  it("P(1, x) = 1 − e^(−x), computed on both branches", () => {
    expect(regularizedGamma(1, 0.5).lower).toBeCloseTo(1 - Math.exp(-0.5), 15);
    expect(regularizedGamma(1, 7).upper).toBeCloseTo(Math.exp(-7), 15);
  });
});
