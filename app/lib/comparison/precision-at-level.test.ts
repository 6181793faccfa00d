import { describe, expect, it } from "vitest";
import { analyzeStudy, type ResultRow } from "~/lib/precision";
import { compareMixtures } from "./compare-mixtures";
import { precisionAtLevel } from "./precision-at-level";
import { comparisonVerdict } from "./verdict";

// A small made-up study: 4 labs, 3 materials at levels near 10, 20 and 30 passes, 2 results per cell.
const CELLS: Record<string, number[][]> = {
  M1: [[9, 10], [11, 10], [10, 12], [9, 9]],
  M2: [[19, 21], [22, 20], [18, 20], [21, 23]],
  M3: [[28, 31], [33, 30], [29, 27], [32, 34]],
};
const rows: ResultRow[] = Object.entries(CELLS).flatMap(([material, labs]) =>
  labs.flatMap((values, lab) => values.map((value, i) => ({ lab: `L0${lab + 1}`, material, response: "passes", replicate: i + 1, value }))),
);
const analysis = analyzeStudy(rows, { responseKinds: { passes: "count" } });

describe("precisionAtLevel", () => {
  it("uses the statement's chosen level relation (ISO 5725-2, dependence on level)", () => {
    const fit = analysis.levelFits.find((f) => f.response === "passes")!;
    const at = precisionAtLevel(analysis, "passes", 20)!;
    expect(at.basis).toBe("level-relation");
    const model = fit.sr.candidates.find((c) => c.relation === fit.sr.chosen)!;
    const expected = model.relation === "proportional" ? model.b * 20 : model.relation === "linear" ? model.a + model.b * 20 : 10 ** (model.c + model.d * Math.log10(20));
    expect(at.sr).toBeCloseTo(expected, 12);
    expect(at.sR).toBeGreaterThanOrEqual(at.sr);
    expect(at.outsideStudiedRange).toBe(false);
  });

  it("flags a level outside the studied materials", () => {
    expect(precisionAtLevel(analysis, "passes", 45)!.outsideStudiedRange).toBe(true);
  });

  it("falls back to the nearest material with fewer than 3 materials", () => {
    const two = analyzeStudy(rows.filter((r) => r.material !== "M3"), { responseKinds: { passes: "count" } });
    const at = precisionAtLevel(two, "passes", 19)!;
    const m2 = two.groups.find((g) => g.material === "M2" && g.status === "computed")!;
    expect(at).toMatchObject({ basis: "nearest-material", material: "M2" });
    expect(at.sr).toBe(m2.status === "computed" ? m2.sr : NaN);
  });

  it("is null for a response the statement has no figures for", () => {
    expect(precisionAtLevel(analysis, "surface", 10)).toBeNull();
  });
});

describe("compareMixtures", () => {
  it("sets the difference of averages against the within-lab critical difference", () => {
    const result = compareMixtures(analysis, "passes", "same-lab", { label: "reference mix", values: [18, 20, 19] }, { label: "trial mix", values: [24, 23, 25] })!;
    expect(result.difference).toBeCloseTo(5, 12);
    expect(result.criticalDifference).toBeCloseTo(2.8 * result.precision.sr * Math.sqrt(1 / 3), 12);
    expect(result.real).toBe(result.criticalDifference < 5);
    expect(comparisonVerdict(result, "passes")).toContain("trial mix took 5.0 more passes on average than reference mix");
  });
});
