import { describe, expect, it } from "vitest";
import { seededUniform } from "~/lib/precision/seeded-uniform";
import { analyzeRuggedness, type RuggednessFactor } from "./analyze";
import { settingText } from "./conclusions";
import { plackettBurmanDesign } from "./designs";

const FACTORS: RuggednessFactor[] = [
  { column: 1, name: "Float angle", unit: "°", low: "5", high: "10" },
  { column: 2, name: "Time to start floating", unit: "min", low: "10", high: "20" },
  { column: 3, name: "Strike-off height", unit: "mm", low: "3", high: "6" },
  { column: 4, name: "Hole depth", unit: "mm", low: "45", high: "55" },
  { column: 5, name: "Operator", unit: "", low: "A", high: "B" },
];
const RESPONSE = { name: "Passes to close the holes", unit: "passes" };

/** Results from y = 12 + 1.5·x₂ + small noise: only column 2 (time to start floating) matters. */
function plantedResults(replicates: number, seed: number) {
  const uniform = seededUniform(seed);
  return plackettBurmanDesign(8).map((row) => Array.from({ length: replicates }, () => 12 + 1.5 * row[1]! + (uniform() - 0.5) * 0.6));
}

describe("analyzeRuggedness", () => {
  it("with single results tests against the two dummy columns and finds the planted factor", () => {
    const analysis = analyzeRuggedness(8, FACTORS, plantedResults(1, 7), RESPONSE);
    if (analysis.status !== "computed") throw new Error("expected computed");
    expect(analysis.scatter?.basis).toBe("dummy-columns");
    expect(analysis.scatter?.degreesOfFreedom).toBe(2);
    expect(analysis.columns.map((c) => c.label)).toEqual([...FACTORS.map((f) => f.name), "Dummy 1", "Dummy 2"]);
    expect(analysis.columns.filter((c) => c.test?.significant).map((c) => c.column)).toEqual([2]);
    expect(analysis.columns[1]!.effect).toBeCloseTo(3, 0);
    expect(analysis.columns[1]!.conclusion).toMatch(/^Time to start floating matters: going from 10 min to 20 min/);
    expect(analysis.columns[0]!.conclusion).toMatch(/^Hold float angle within the tested range \(5° to 10°\)/);
    expect(analysis.halfNormal.at(-1)!.label).toBe("Time to start floating");
  });

  it("with duplicates tests against the replicate standard deviation", () => {
    const analysis = analyzeRuggedness(8, FACTORS, plantedResults(2, 11), RESPONSE);
    if (analysis.status !== "computed") throw new Error("expected computed");
    expect(analysis.scatter).toMatchObject({ basis: "replicates", degreesOfFreedom: 8 });
    expect(analysis.columns.filter((c) => c.test?.significant).map((c) => c.column)).toEqual([2]);
  });

  it("without dummy columns or replicates leaves the judgement to the half-normal plot", () => {
    const seven = [...FACTORS, { column: 6, name: "Form oil", unit: "", low: "none", high: "light" }, { column: 7, name: "Room temperature", unit: "°C", low: "18", high: "26" }];
    const analysis = analyzeRuggedness(8, seven, plantedResults(1, 3), RESPONSE);
    if (analysis.status !== "computed") throw new Error("expected computed");
    expect(analysis.scatter).toBeNull();
    expect(analysis.columns[0]!.conclusion).toContain("judge it on the half-normal plot");
  });

  it("lists the runs still without results", () => {
    const results = plantedResults(1, 5);
    results[2] = [];
    results[6] = [];
    expect(analyzeRuggedness(8, FACTORS, results, RESPONSE)).toEqual({ status: "incomplete", missingRuns: [3, 7] });
  });
});

describe("settingText", () => {
  it("writes degrees and percent against the number, other units after a space", () => {
    expect(settingText("10", "°")).toBe("10°");
    expect(settingText("20", "min")).toBe("20 min");
    expect(settingText("Operator A", "")).toBe("Operator A");
  });
});
