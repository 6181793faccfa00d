import { describe, expect, it } from "vitest";
import { analyzeStudy } from "./analyze-study";
import type { ResultRow } from "./types";

function rows(labs: number, materials: string[], replicates: number): ResultRow[] {
  const out: ResultRow[] = [];
  for (const material of materials)
    for (let lab = 1; lab <= labs; lab++)
      for (let replicate = 1; replicate <= replicates; replicate++)
        out.push({ lab: `L${lab}`, material, response: "slump", replicate, value: 50 + lab * 0.3 + replicate * 0.7 + (lab * replicate) % 3 });
  return out;
}

// ASTM E691: at least 6 labs, 3 materials, 2 replicates; ISO 5725-1 recommends 8 labs.
describe("study warnings", () => {
  it("says when there are fewer than 6 labs, naming the practices", () => {
    const { warnings } = analyzeStudy(rows(3, ["M1", "M2", "M3"], 2));
    expect(warnings.map((w) => w.code)).toEqual(["few-labs"]);
    expect(warnings[0].message).toMatch(/at least 6 labs and ISO 5725-1 recommends at least 8/);
    expect(warnings[0].message).toMatch(/with 3 labs the h and Grubbs tests can hardly flag anything/);
  });

  it("says when a response has fewer than 3 materials", () => {
    const { warnings } = analyzeStudy(rows(6, ["M1", "M2"], 2));
    expect(warnings).toEqual([expect.objectContaining({ code: "few-materials", response: "slump" })]);
  });

  it("says when a cell has fewer than 2 results", () => {
    const { warnings } = analyzeStudy(rows(6, ["M1", "M2", "M3"], 1));
    expect(warnings.map((w) => w.code)).toContain("few-replicates");
  });

  it("is silent for a design that meets the minimums", () => {
    expect(analyzeStudy(rows(6, ["M1", "M2", "M3"], 2)).warnings).toEqual([]);
  });
});
