import { describe, expect, it } from "vitest";
import { screenCells, screenCochran, screenGrubbsDouble, screenGrubbsSingle } from "./screening";

const labs = ["L1", "L2", "L3", "L4", "L5", "L6", "L7", "L8"];
const variances = [1, 1.2, 0.8, 1.1, 0.9, 1, 1.3, 0.7];

describe("screenCells: ISO 5725-2 §7.3 in order", () => {
  it("runs Cochran, then single Grubbs high and low, then the double test on both sides when the singles found nothing", () => {
    const { steps } = screenCells({ labs, means: [10.1, 9.9, 10.0, 10.2, 9.8, 10.05, 9.95, 10.15], variances, n: 3 });
    expect(steps.map((step) => `${step.test}:${step.side ?? ""}`)).toEqual([
      "cochran:",
      "grubbs-single:high",
      "grubbs-single:low",
      "grubbs-double:high",
      "grubbs-double:low",
    ]);
    expect(steps.every((step) => step.outcome === "passed")).toBe(true);
  });

  // The double test used to run even when the single test on that side had already found the lab,
  // and flagged its neighbour with it (the demo's "L06 · M2 · surface — Grubbs high (straggler)" at h = 0.10).
  it("skips the double test on a side where the single test found a lab", () => {
    const { steps, grubbs } = screenCells({ labs, means: [10.1, 9.9, 10.0, 10.2, 9.8, 10.05, 9.95, 13], variances, n: 3 });
    expect(grubbs.high).toMatchObject({ lab: "L8", class: "outlier" });
    expect(grubbs.doubleHigh).toBeNull();
    expect(steps.find((step) => step.test === "grubbs-double" && step.side === "high")).toMatchObject({
      outcome: "not-run",
      reason: expect.stringMatching(/already found L8/),
    });
    expect(steps.find((step) => step.test === "grubbs-double" && step.side === "low")?.outcome).toBe("passed");
  });

  it("flags a pair only for the two most extreme averages", () => {
    // L7 and L8 sit together high: each single test is masked by the other, the double test catches both.
    const means = [10.1, 9.9, 10.0, 10.2, 9.8, 10.05, 11.5, 11.6];
    const { grubbs, steps } = screenCells({ labs, means, variances, n: 3 });
    expect(grubbs.high.class).toBeNull();
    expect(grubbs.doubleHigh).toMatchObject({ labs: ["L8", "L7"], class: "outlier" });
    expect(steps.filter((step) => step.outcome === "flagged").map((step) => step.labs)).toEqual([["L8", "L7"]]);
  });
});

describe("ties make a test uninformative, and it says so instead of flagging", () => {
  // Whole-number pass counts: averages of 3 counts tie easily.
  it("double test: the other labs all tie, so the statistic is 0 whatever the pair does", () => {
    const result = screenGrubbsDouble({ labs: labs.slice(0, 4), means: [9, 9, 9.67, 10.33], variances: [1, 1, 1, 1], n: 3 }, "high");
    expect(result?.G).toBe(0);
    expect(result?.class).toBeNull();
    expect(result?.uninformative).toMatch(/same average/);
  });

  it("single test: two labs share the extreme average", () => {
    const result = screenGrubbsSingle({ labs: labs.slice(0, 5), means: [15.33, 14, 14.33, 15.33, 14.67], variances: [1, 1, 1, 1, 1], n: 3 }, "high");
    expect(result.class).toBeNull();
    expect(result.uninformative).toMatch(/L1 and L4 share the highest average/);
  });

  it("single test: every other average is equal, so G is at its largest possible value", () => {
    const result = screenGrubbsSingle({ labs: labs.slice(0, 6), means: [12, 12, 12, 12, 12, 12.33], variances: [1, 1, 1, 1, 1, 1], n: 3 }, "high");
    expect(result.G).toBeCloseTo(5 / Math.sqrt(6), 12);
    expect(result.class).toBeNull();
    expect(result.uninformative).toMatch(/largest possible value/);
  });

  it("Cochran: only one lab shows any spread, so C = 1", () => {
    const result = screenCochran({ labs: labs.slice(0, 6), means: [1, 2, 3, 4, 5, 6], variances: [0, 0, 0.33, 0, 0, 0], n: 3 });
    expect(result.C).toBe(1);
    expect(result.class).toBeNull();
    expect(result.uninformative).toMatch(/only L3 shows any spread/);
  });

  it("a pair is not flagged when the second most extreme average is shared", () => {
    const result = screenGrubbsDouble({ labs: labs.slice(0, 6), means: [10, 10.1, 9.9, 12, 11, 11], variances: [1, 1, 1, 1, 1, 1], n: 3 }, "high");
    expect(result?.class).toBeNull();
    expect(result?.uninformative).toMatch(/L5 and L6 share the second highest average/);
  });
});
