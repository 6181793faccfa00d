import { describe, expect, it } from "vitest";
import { scoreGroup, ScoringRefusal } from "./score-round";

const labs = [95, 102, 98, 110, 100, 97, 104, 99, 101, 150, 96, 103].map((value, index) => ({
  labCode: `P${String(index + 1).padStart(2, "0")}`,
  values: [value],
}));

describe("scoreGroup", () => {
  it("scores against the Algorithm A consensus with σ_pt from the published precision", () => {
    // x* and s* of these results are the R reference in algorithm-a.test.ts.
    const scores = scoreGroup(labs, { method: "consensus" }, { method: "precision", atLevel: () => ({ sr: 3, sR: 6 }) }, 1);
    expect(scores.assignedValue).toBeCloseTo(101.0343378726, 8);
    expect(scores.assignedUncertainty).toBeCloseTo((1.25 * 5.11445957535) / Math.sqrt(12), 8);
    expect(scores.sigmaPt).toBe(6);
    // u = 1.85 > 0.3·6 = 1.8, so z′ carries the verdict
    expect(scores.uncertaintyNegligible).toBe(false);
    const outlier = scores.labs.find((lab) => lab.labCode === "P10")!;
    expect(outlier.scoreKind).toBe("z′");
    expect(outlier.z).toBeCloseTo((150 - 101.0343378726) / 6, 8);
    expect(outlier.verdict).toBe("unsatisfactory");
    expect(scores.labs.find((lab) => lab.labCode === "P04")!.verdict).toBe("satisfactory");
  });

  it("uses z with a reference value of negligible uncertainty, and ζ where the lab gives its uncertainty", () => {
    const entries = [
      { labCode: "A", values: [10, 10.4], uncertainty: 0.3 },
      { labCode: "B", values: [12.9], uncertainty: null },
      { labCode: "C", values: [10.1] },
    ];
    const scores = scoreGroup(entries, { method: "reference", value: 10, uncertainty: 0.1 }, { method: "fixed", value: 1 }, 2);
    const [a, b] = scores.labs;
    expect(a.result).toBeCloseTo(10.2, 12);
    expect(a.scoreKind).toBe("z");
    expect(a.z).toBeCloseTo(0.2, 12);
    expect(a.zeta).toBeCloseTo(0.2 / Math.sqrt(0.09 + 0.01), 12);
    expect(b.zeta).toBeNull();
    expect(b.verdict).toBe("questionable");
  });

  it("takes u(x_pt) from the plain standard deviation when more than half the labs agree exactly", () => {
    const counts = [12, 12, 12, 12, 12, 13, 11, 14].map((value, index) => ({ labCode: `L${index}`, values: [value] }));
    const scores = scoreGroup(counts, { method: "consensus" }, { method: "fixed", value: 1 }, 1);
    expect(scores.robust.degenerate).toBe(true);
    expect(scores.assignedValue).toBe(12);
    // sample SD of the eight results = √(4/7) (mean 12.25); u = 1.25·s/√8
    const mean = 12.25;
    const sd = Math.sqrt([12, 12, 12, 12, 12, 13, 11, 14].reduce((sum, v) => sum + (v - mean) ** 2, 0) / 7);
    expect(scores.assignedUncertainty).toBeCloseTo((1.25 * sd) / Math.sqrt(8), 12);
  });

  it("refuses a robust σ_pt of zero with a reason", () => {
    const same = ["A", "B", "C", "D", "E"].map((labCode, index) => ({ labCode, values: [index === 4 ? 9 : 7] }));
    expect(() => scoreGroup(same, { method: "consensus" }, { method: "robust" }, 1)).toThrow(ScoringRefusal);
  });
});
