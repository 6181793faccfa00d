import { mean, sampleStandardDeviation } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { averageOfCellAverages, averageReplicates, mostFrequentReplicates, replicateWeightedMean, standardDeviationOfCellAverages } from "./cell-averages";

describe("cell averages", () => {
  const means = [10.2, 9.8, 10.5, 10.1];

  it("x̿ and s_x̄ agree with simple-statistics' mean and sample standard deviation", () => {
    // Reference library: simple-statistics 7.12.1.
    expect(averageOfCellAverages(means)).toBeCloseTo(mean(means), 13);
    expect(standardDeviationOfCellAverages(means)).toBeCloseTo(sampleStandardDeviation(means), 13);
  });

  it("weights the general mean by replicates, and equals x̿ with equal replicates", () => {
    // ISO 5725-2, general mean: Σ n_i x̄_i / Σ n_i.
    expect(replicateWeightedMean([{ n: 3, mean: 10 }, { n: 1, mean: 14 }])).toBe(11);
    const equal = means.map((m) => ({ n: 2, mean: m }));
    expect(replicateWeightedMean(equal)).toBeCloseTo(averageOfCellAverages(means), 14);
  });

  it("n̄ follows ISO 5725-2 and equals n when all cells have n", () => {
    // ISO 5725-2: n̄ = (Σn − Σn²/Σn)/(p − 1); for counts 2, 3, 4: (9 − 29/9)/2 = 26/9.
    expect(averageReplicates([2, 3, 4])).toBeCloseTo(26 / 9, 14);
    expect(averageReplicates([3, 3, 3, 3])).toBe(3);
    expect(averageReplicates([5])).toBe(5);
  });

  it("most frequent replicate count takes the larger one on a tie", () => {
    expect(mostFrequentReplicates([3, 3, 2, 4])).toBe(3);
    expect(mostFrequentReplicates([2, 2, 3, 3])).toBe(3);
  });

  it("needs enough cells", () => {
    expect(() => standardDeviationOfCellAverages([1])).toThrow(RangeError);
    expect(() => averageOfCellAverages([])).toThrow(RangeError);
  });
});
