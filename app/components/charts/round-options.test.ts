import { describe, expect, it } from "vitest";
import { resultBins } from "./round-options";

describe("resultBins", () => {
  it("centres a bin of width σ_pt/2 on x_pt and counts each lab once", () => {
    const distribution = [
      { labCode: "L01", result: 10 },
      { labCode: "L02", result: 10.4 },
      { labCode: "L03", result: 11.1 },
      { labCode: "L04", result: 14 },
    ];
    const bins = resultBins(distribution, 10, 2, "L03");
    const centre = bins.find((b) => b.from <= 10 && 10 < b.to)!;
    expect(centre.to - centre.from).toBeCloseTo(1, 12);
    expect(centre.labCodes).toEqual(["L01", "L02"]);
    expect(bins.filter((b) => b.own).flatMap((b) => b.labCodes)).toEqual(["L03"]);
    expect(bins.reduce((n, b) => n + b.labCodes.length, 0)).toBe(4);
  });
});
