import { describe, expect, it } from "vitest";
import { c670Form, relativeSpread } from "./c670-form";

// The rule (ASTM C670's choice, stated as one rule): percent form for both precisions when
// the coefficient of variation is steadier across levels than the standard deviation.
describe("c670Form", () => {
  it("percent when s grows with the level (constant CV)", () => {
    const form = c670Form([{ level: 10, sr: 0.5, sR: 1 }, { level: 20, sr: 1, sR: 2 }, { level: 40, sr: 2, sR: 4 }]);
    expect(form.form).toBe("percent");
    expect(form.reason).toMatch(/both precisions are given in percent/);
  });

  it("absolute when s stays put across levels", () => {
    expect(c670Form([{ level: 10, sr: 0.5, sR: 1 }, { level: 20, sr: 0.52, sR: 1.05 }, { level: 40, sr: 0.49, sR: 0.98 }]).form).toBe("absolute");
  });

  it("one form for both even when s_r alone would go the other way (the sums decide)", () => {
    // s_r constant, s_R proportional: spread of s = 0 + 0.57, of CV = 0.57 + 0 → tie → absolute
    const form = c670Form([{ level: 10, sr: 1, sR: 1 }, { level: 20, sr: 1, sR: 2 }, { level: 40, sr: 1, sR: 4 }]);
    expect(["percent", "absolute"]).toContain(form.form);
    expect(form.reason).toMatch(/both precisions/);
  });

  it("absolute when levels cross zero or only one material", () => {
    expect(c670Form([{ level: -1, sr: 1, sR: 2 }, { level: 3, sr: 1, sR: 2 }]).form).toBe("absolute");
    expect(c670Form([{ level: 5, sr: 1, sR: 2 }]).form).toBe("absolute");
  });

  it("relativeSpread is sd/|mean|", () => {
    expect(relativeSpread([1, 3])).toBeCloseTo(Math.SQRT2 / 2, 14);
  });
});
