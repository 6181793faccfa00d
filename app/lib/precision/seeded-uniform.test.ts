import { mean, variance } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { seededUniform } from "./seeded-uniform";

describe("seededUniform", () => {
  it("repeats for a seed and differs between seeds", () => {
    const a = seededUniform(1);
    const b = seededUniform(1);
    const c = seededUniform(2);
    const first = [a(), a(), a()];
    expect([b(), b(), b()]).toEqual(first);
    expect([c(), c(), c()]).not.toEqual(first);
  });

  it("is uniform on [0, 1): mean 1/2 and variance 1/12 (common practice), simple-statistics as reference", () => {
    const next = seededUniform(123);
    const draws = Array.from({ length: 100_000 }, next);
    expect(Math.min(...draws)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...draws)).toBeLessThan(1);
    expect(mean(draws)).toBeCloseTo(0.5, 2);
    expect(variance(draws)).toBeCloseTo(1 / 12, 3);
  });
});
