import { describe, expect, it } from "vitest";
import { outlierClass } from "./outlier-class";

describe("outlierClass", () => {
  it("ISO 5725-2: straggler beyond the 5 % value, outlier beyond the 1 % value (large values suspect)", () => {
    expect(outlierClass(0.5, 0.6, 0.7, "above")).toBeNull();
    expect(outlierClass(0.65, 0.6, 0.7, "above")).toBe("straggler");
    expect(outlierClass(0.75, 0.6, 0.7, "above")).toBe("outlier");
  });

  it("small values suspect (double Grubbs)", () => {
    expect(outlierClass(0.3, 0.2, 0.1, "below")).toBeNull();
    expect(outlierClass(0.15, 0.2, 0.1, "below")).toBe("straggler");
    expect(outlierClass(0.05, 0.2, 0.1, "below")).toBe("outlier");
  });

  it("an undefined statistic is never classed", () => {
    expect(outlierClass(null, 0.6, 0.7, "above")).toBeNull();
  });
});
