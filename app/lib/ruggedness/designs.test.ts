import { describe, expect, it } from "vitest";
import { designFor, maxFactors, plackettBurmanDesign } from "./designs";

describe("plackettBurmanDesign", () => {
  it.each([8, 12] as const)("%i runs: N rows of N − 1 columns, the last run all low", (runs) => {
    const design = plackettBurmanDesign(runs);
    expect(design).toHaveLength(runs);
    for (const row of design) expect(row).toHaveLength(runs - 1);
    expect(design[runs - 1]!.every((v) => v === -1)).toBe(true);
  });

  it("starts from the generator rows printed by Plackett & Burman (1946) for N = 8 and N = 12", () => {
    expect(plackettBurmanDesign(8)[0]).toEqual([1, 1, 1, -1, 1, -1, -1]);
    expect(plackettBurmanDesign(12)[0]).toEqual([1, 1, -1, 1, 1, 1, -1, -1, -1, 1, -1]);
  });

  it.each([8, 12] as const)("%i runs: every column is balanced and every pair of columns orthogonal (the defining property, Plackett & Burman 1946)", (runs) => {
    const design = plackettBurmanDesign(runs);
    const columns = runs - 1;
    for (let a = 0; a < columns; a++) {
      expect(design.reduce((sum, row) => sum + row[a]!, 0)).toBe(0);
      for (let b = a + 1; b < columns; b++) expect(design.reduce((sum, row) => sum + row[a]! * row[b]!, 0)).toBe(0);
    }
  });
});

describe("designFor", () => {
  it("takes up to 7 factors in 8 runs and up to 11 in 12 runs (ASTM E1169)", () => {
    expect(maxFactors(8)).toBe(7);
    expect(designFor(5)).toBe(8);
    expect(designFor(7)).toBe(8);
    expect(designFor(8)).toBe(12);
    expect(designFor(11)).toBe(12);
    expect(designFor(12)).toBeNull();
  });
});
