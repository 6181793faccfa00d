import { describe, expect, it } from "vitest";
import { analyzeStudy, type ComputedGroup, type Finding } from "~/lib/precision";
import { CLEAN_CELLS, L03_WIDE, L05_HIGH, toRows } from "~/lib/precision/planted-outliers.fixture";
import { flaggedCells, labClasses, suggestedQuestion } from "./flags";

// Invented: the clean 8 labs × 3 replicates with L05 planted 5 units high and L03 with a wide scatter.
const CELLS = { ...CLEAN_CELLS, ...L03_WIDE, ...L05_HIGH };
const rows = toRows(CELLS);
const analysis = analyzeStudy(rows);
const group = analysis.groups[0] as ComputedGroup;

const finding = (test: Finding["test"], side: Finding["side"] = null, partner: string | null = null): Finding => ({
  test,
  side,
  statistic: 1,
  critical: null,
  critical5: null,
  critical1: null,
  class: null,
  partner,
  text: "",
});

describe("flaggedCells", () => {
  it("lists each flagged lab with every test that raised it and its statistic text", () => {
    const flagged = flaggedCells(analysis);
    expect(flagged.map((f) => `${f.lab}:${f.tests.join("+")}`)).toEqual(["L03:k+cochran", "L05:h+grubbs-single"]);
    expect(flagged[1].statistic).toMatch(/^h = \d\.\d\d, beyond ±\d\.\d\d \(ASTM E691 at 0\.5 %\); Grubbs' single test \(high side\): G = /);
  });
});

describe("labClasses", () => {
  it("takes the ISO 5725-2 classes from the lab's findings only", () => {
    expect(labClasses(group, "L05")).toEqual({ cochran: null, grubbs: "outlier", grubbsSide: "high" });
    expect(labClasses(group, "L03").cochran).toBe("outlier");
    expect(labClasses(group, "L01")).toEqual({ cochran: null, grubbs: null, grubbsSide: null });
  });
});

describe("suggestedQuestion", () => {
  const cell = { lab: "L05", material: "M1", response: "slump" };
  it("asks about the scatter within the replicates for k and Cochran", () => {
    expect(suggestedQuestion(cell, "k = 2.5", [finding("k")])).toMatch(/the scatter between your replicate results is larger than in the other labs \(k = 2\.5\)/);
    expect(suggestedQuestion(cell, "C", [finding("cochran")])).toMatch(/between the replicate specimens/);
  });
  it("asks about the average and names the side for h and single Grubbs", () => {
    expect(suggestedQuestion(cell, "h", [finding("h", "low")])).toMatch(/your average lies below the other labs' averages/);
    expect(suggestedQuestion(cell, "G", [finding("grubbs-single", "high")])).toMatch(/your average lies above/);
  });
  it("names the other lab of a double-Grubbs pair", () => {
    expect(suggestedQuestion(cell, "G", [finding("grubbs-double", "high", "L07")])).toMatch(/your average and lab L07's lie together above/);
  });
  it("never says the results stand apart", () => {
    expect(suggestedQuestion(cell, "x", [])).not.toMatch(/stand apart/);
  });
});
