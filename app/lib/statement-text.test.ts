import { describe, expect, it } from "vitest";
import { analyzeStudy, type ComputedGroup, type ResultRow } from "~/lib/precision";
import { c670Text, e691Text, percentFormSteadier, type StatementSnapshot } from "./statement-text";

// Planted data (invented): 4 labs, 2 materials, 2 replicates; L4 on B is left out.
const VALUES: Record<string, Record<string, number[]>> = {
  A: { L1: [10, 11], L2: [12, 12], L3: [9, 10], L4: [11, 13] },
  B: { L1: [20, 22], L2: [23, 24], L3: [19, 21], L4: [30, 31] },
};
const rows: ResultRow[] = Object.entries(VALUES).flatMap(([material, labs]) =>
  Object.entries(labs).flatMap(([lab, values]) => values.map((value, i) => ({ lab, material, response: "holes", replicate: i + 1, value }))),
);
const analysis = analyzeStudy(rows, { excludedCells: [{ lab: "L4", material: "B", response: "holes", reason: "batch water doubled by mistake" }] });
const snapshot: StatementSnapshot = {
  study: { code: "T-1", title: "Test", testMethod: "Float finishing test" },
  dataVersion: 3,
  frozenAt: "2026-01-01T00:00:00.000Z",
  labs: 4,
  replicates: 2,
  materials: [
    { code: "A", description: "" },
    { code: "B", description: "" },
  ],
  responses: [{ key: "holes", name: "Passes to close the holes", unit: "passes", decimals: 0 }],
  analysis,
};
const a = analysis.groups.find((g) => g.material === "A") as ComputedGroup;

describe("E691 form", () => {
  const text = e691Text(snapshot);
  it("states the design and the excluded cell", () => {
    expect(text).toContain("4 laboratories");
    expect(text).toContain("2 materials (A, B)");
    expect(text).toContain("2 replicate results");
    expect(text).toContain("lab L4, material B, holes: batch water doubled by mistake");
  });
  it("reports the engine's s_r, s_R, r and R of each material", () => {
    expect(text).toContain(`A, average ${a.mean.toFixed(1)} passes: s_r = ${a.sr.toFixed(2)}, s_R = ${a.sR.toFixed(2)}, r = ${a.r.toFixed(1)}, R = ${a.R.toFixed(1)}`);
    // ASTM E691: r = 2.8 s_r.
    expect(a.r / a.sr).toBeCloseTo(2.8, 10);
  });
});

describe("C670 form", () => {
  const text = c670Text(snapshot);
  it("gives 1s and d2s with d2s = 2√2 · 1s", () => {
    // ASTM C670: d2s = 2·√2·s, about 2.83 s.
    expect(a.d2sr / a.oneSr).toBeCloseTo(2 * Math.SQRT2, 10);
    expect(text).toMatch(/Single-operator precision/);
    expect(text).toMatch(/Multilaboratory precision/);
    expect(text).toContain("left out of the analysis");
  });
  it("chooses the percent form when the coefficient of variation is the steadier figure", () => {
    const proportional = [
      { sr: 1, sR: 2, cvr: 10, cvR: 20 },
      { sr: 2, sR: 4, cvr: 10, cvR: 20 },
    ] as ComputedGroup[];
    expect(percentFormSteadier(proportional, "r")).toBe(true);
    const constant = [
      { sr: 1, sR: 2, cvr: 10, cvR: 20 },
      { sr: 1, sR: 2, cvr: 5, cvR: 10 },
    ] as ComputedGroup[];
    expect(percentFormSteadier(constant, "R")).toBe(false);
  });
  it("says when nothing was excluded", () => {
    expect(c670Text({ ...snapshot, analysis: analyzeStudy(rows) })).toContain("Every submitted cell was used");
  });
});
