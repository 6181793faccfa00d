import { describe, expect, it } from "vitest";
import { significanceDescription } from "./significance-text";

describe("significanceDescription", () => {
  it("E691's 0.5 %: t and F at 0.995; Cochran and Grubbs unchanged", () => {
    const text = significanceDescription(0.005);
    expect(text).toMatch(/Student's t at 0\.995/);
    expect(text).toMatch(/F quantile at 0\.995/);
    expect(text).toMatch(/always judged at 5 % \(straggler\) and 1 % \(outlier\)/);
  });

  it("ISO 5 %: two-sided t at 0.975, F at 0.95", () => {
    const text = significanceDescription(0.05);
    expect(text).toMatch(/two-sided Student's t at 0\.975/);
    expect(text).toMatch(/F quantile at 0\.95 /);
  });
});
