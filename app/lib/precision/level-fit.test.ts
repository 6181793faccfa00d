import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { levelFit, predictLevelModel, weightedLinearFit } from "./level-fit";

// Independent computation with NumPy of ISO 5725-2's iterated weighted fit (tests/fixtures/precision-scipy-intervals.py).
const reference = JSON.parse(readFileSync(new URL("../../../tests/fixtures/precision-scipy-intervals.json", import.meta.url), "utf8")) as {
  weightedLinear: { levels: number[]; s: number[]; a: number; b: number };
};

const levels = [5, 12, 30, 60, 110];

describe("levelFit", () => {
  it("recovers s = b·m and chooses it", () => {
    const result = levelFit(levels.map((level) => ({ level, s: 0.03 * level })));
    expect(result.chosen).toBe("proportional");
    const proportional = result.candidates.find((candidate) => candidate.relation === "proportional");
    expect(proportional).toMatchObject({ b: expect.closeTo(0.03, 12) });
    expect(proportional?.residualSd).toBeLessThan(1e-12);
    expect(result.reason).toMatch(/^s = b·m has the smallest relative residual standard deviation/);
  });

  it("relation I weighted by 1/ŝ² ∝ 1/m² gives b = Σ(s/m)/q (ISO 5725-2 §7.5)", () => {
    const points = [{ level: 2, s: 0.1 }, { level: 5, s: 0.4 }, { level: 10, s: 0.6 }];
    const proportional = levelFit(points).candidates.find((c) => c.relation === "proportional");
    expect(proportional).toMatchObject({ b: expect.closeTo((0.05 + 0.08 + 0.06) / 3, 14) });
  });

  it("recovers s = a + b·m and chooses it", () => {
    const result = levelFit(levels.map((level) => ({ level, s: 0.4 + 0.01 * level })));
    expect(result.chosen).toBe("linear");
    expect(result.candidates.find((candidate) => candidate.relation === "linear")).toMatchObject({
      a: expect.closeTo(0.4, 12),
      b: expect.closeTo(0.01, 12),
    });
  });

  it("relation II is weighted by 1/ŝ² from the fitted values and iterated, as NumPy computes it", () => {
    const { levels: m, s, a, b } = reference.weightedLinear;
    const fit = weightedLinearFit(m.map((level, i) => ({ level, s: s[i] })));
    expect(fit).toMatchObject({ a: expect.closeTo(a, 11), b: expect.closeTo(b, 12) });
    expect("iterations" in fit && fit.iterations).toBeGreaterThan(1);
  });

  it("recovers log s = c + d·log m and chooses it", () => {
    const result = levelFit(levels.map((level) => ({ level, s: 0.2 * level ** 0.6 })));
    expect(result.chosen).toBe("log-linear");
    const power = result.candidates.find((candidate) => candidate.relation === "log-linear");
    expect(power).toMatchObject({ c: expect.closeTo(Math.log10(0.2), 12), d: expect.closeTo(0.6, 12) });
    if (power) expect(predictLevelModel(power, 40)).toBeCloseTo(0.2 * 40 ** 0.6, 10);
  });

  it("needs 3 materials", () => {
    const result = levelFit([{ level: 1, s: 0.1 }, { level: 2, s: 0.2 }]);
    expect(result.chosen).toBeNull();
    expect(result.candidates).toEqual([]);
    expect(result.notes[0]).toMatch(/at least 3 materials/);
  });

  // A response whose levels cross zero is never fitted as proportional
  // (this test used to expect s = b·m among the candidates).
  it("never fits s = b·m when the levels cross zero, and skips the log relation there", () => {
    const result = levelFit([{ level: -2, s: 0.1 }, { level: 3, s: 0.2 }, { level: 8, s: 0.35 }]);
    expect(result.candidates.map((candidate) => candidate.relation)).toEqual(["linear"]);
    expect(result.notes.join(" ")).toMatch(/cross it/);
    expect(result.notes.join(" ")).toMatch(/above 0/);
  });

  it("drops s = a + b·m when it predicts a precision at or below 0", () => {
    // s = 0 at two levels: the first round is unweighted, s = −2 + 1.5·m, which is negative at m = 1.
    const result = levelFit([{ level: 1, s: 0 }, { level: 2, s: 0 }, { level: 3, s: 3 }]);
    expect(result.candidates.some((c) => c.relation === "linear")).toBe(false);
    expect(result.notes.join(" ")).toMatch(/s ≤ 0/);
  });

  it("fits tiny figures as well as ordinary ones (working scale)", () => {
    const tiny = levelFit(levels.map((level) => ({ level: level * 1e-200, s: (0.4 + 0.01 * level) * 1e-201 })));
    expect(tiny.chosen).toBe("linear");
    expect(tiny.candidates.find((c) => c.relation === "linear")).toMatchObject({ a: expect.closeTo(0.4e-201, 212), b: expect.closeTo(0.001, 12) });
  });

  it("fits only s = b·m when all levels are equal", () => {
    const result = levelFit([{ level: 4, s: 0.1 }, { level: 4, s: 0.2 }, { level: 4, s: 0.15 }]);
    expect(result.chosen).toBe("proportional");
    expect(result.notes[0]).toMatch(/one level/);
  });
});
