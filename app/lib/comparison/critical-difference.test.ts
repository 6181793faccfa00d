import { describe, expect, it } from "vitest";
import { standardNormalQuantile } from "~/lib/normal-distribution";
import { seededUniform } from "~/lib/precision/seeded-uniform";
import { betweenLabCriticalDifference, withinLabCriticalDifference } from "./critical-difference";

function normalSampler(seed: number) {
  const uniform = seededUniform(seed);
  return (sd: number) => sd * standardNormalQuantile(Math.min(Math.max(uniform(), 1e-12), 1 - 1e-12));
}
const average = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;

describe("withinLabCriticalDifference", () => {
  it("with one result each is the repeatability limit r = 2.8·σ_r (ASTM E691, ISO 5725-6)", () => {
    expect(withinLabCriticalDifference(1.2, 1, 1)).toBeCloseTo(2.8 * 1.2, 12);
  });

  it("is 2.8·σ_r·√(1/(2n₁) + 1/(2n₂)): two averages of 3 results with σ_r = 1 (worked by hand)", () => {
    expect(withinLabCriticalDifference(1, 3, 3)).toBeCloseTo(2.8 * Math.sqrt(1 / 3), 12); // 1.6166
  });

  it("covers about 95 % of differences between two averages of simulated repeatability results", () => {
    // Independent check by simulation: same true value, σ_r = 1.5, 2 and 3 results.
    const draw = normalSampler(5725);
    const cd = withinLabCriticalDifference(1.5, 2, 3);
    let inside = 0;
    const trials = 20_000;
    for (let i = 0; i < trials; i++) {
      const a = average([draw(1.5), draw(1.5)]);
      const b = average([draw(1.5), draw(1.5), draw(1.5)]);
      if (Math.abs(a - b) <= cd) inside++;
    }
    // 2.8 is 1.96·√2 rounded up, so the coverage is a little above 95 % (95.2 %).
    expect(inside / trials).toBeGreaterThan(0.945);
    expect(inside / trials).toBeLessThan(0.959);
  });
});

describe("betweenLabCriticalDifference", () => {
  it("with one result each is the reproducibility limit R = 2.8·σ_R (ASTM E691, ISO 5725-6)", () => {
    expect(betweenLabCriticalDifference(1.2, 2.0, 1, 1)).toBeCloseTo(2.8 * 2.0, 12);
  });

  it("shrinks towards 2.8·√2·σ_L as replicates grow (only the lab biases remain)", () => {
    const sr = 1;
    const sR = 2;
    const sL = Math.sqrt(sR ** 2 - sr ** 2);
    expect(betweenLabCriticalDifference(sr, sR, 1e9, 1e9)).toBeCloseTo(2.8 * sL, 6);
  });

  it("covers about 95 % of differences between the averages of two simulated labs", () => {
    // Independent check by simulation: σ_L = 1.2 between labs, σ_r = 0.8 within, 3 results each.
    const draw = normalSampler(56256);
    const sr = 0.8;
    const sL = 1.2;
    const cd = betweenLabCriticalDifference(sr, Math.hypot(sL, sr), 3, 3);
    let inside = 0;
    const trials = 20_000;
    for (let i = 0; i < trials; i++) {
      const labA = draw(sL);
      const labB = draw(sL);
      const a = average([labA + draw(sr), labA + draw(sr), labA + draw(sr)]);
      const b = average([labB + draw(sr), labB + draw(sr), labB + draw(sr)]);
      if (Math.abs(a - b) <= cd) inside++;
    }
    expect(inside / trials).toBeGreaterThan(0.945);
    expect(inside / trials).toBeLessThan(0.959);
  });
});
