import { describe, expect, it } from "vitest";
import { levelFit, predictLevelModel } from "./level-fit";

const levels = [5, 12, 30, 60, 110];

describe("levelFit", () => {
  it("recovers s = b·m and chooses it", () => {
    const result = levelFit(levels.map((level) => ({ level, s: 0.03 * level })));
    expect(result.chosen).toBe("proportional");
    const proportional = result.candidates.find((candidate) => candidate.relation === "proportional");
    expect(proportional).toMatchObject({ b: expect.closeTo(0.03, 12) });
    expect(proportional?.residualSd).toBeLessThan(1e-12);
  });

  it("recovers s = a + b·m and chooses it", () => {
    const result = levelFit(levels.map((level) => ({ level, s: 0.4 + 0.01 * level })));
    expect(result.chosen).toBe("linear");
    expect(result.candidates.find((candidate) => candidate.relation === "linear")).toMatchObject({
      a: expect.closeTo(0.4, 12),
      b: expect.closeTo(0.01, 12),
    });
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

  it("skips the log relation when a level or s is not above 0", () => {
    const result = levelFit([{ level: -2, s: 0.1 }, { level: 3, s: 0.2 }, { level: 8, s: 0.35 }]);
    expect(result.candidates.map((candidate) => candidate.relation)).toEqual(["proportional", "linear"]);
    expect(result.notes[0]).toMatch(/above 0/);
  });

  it("fits only s = b·m when all levels are equal", () => {
    const result = levelFit([{ level: 4, s: 0.1 }, { level: 4, s: 0.2 }, { level: 4, s: 0.15 }]);
    expect(result.chosen).toBe("proportional");
    expect(result.notes[0]).toMatch(/one level/);
  });
});
