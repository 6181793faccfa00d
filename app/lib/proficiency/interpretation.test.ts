import { describe, expect, it } from "vitest";
import { interpretScore } from "./interpretation";

// ISO 13528:2022 9.4.1 / ISO/IEC 17043: |z| ≤ 2.0 satisfactory, 2.0 < |z| < 3.0
// questionable, |z| ≥ 3.0 unsatisfactory.
describe("interpretScore", () => {
  it.each([
    [0, "satisfactory"],
    [2, "satisfactory"],
    [-2, "satisfactory"],
    [2.01, "questionable"],
    [-2.99, "questionable"],
    [3, "unsatisfactory"],
    [-3, "unsatisfactory"],
    [7.4, "unsatisfactory"],
  ] as const)("%d is %s", (score, verdict) => {
    expect(interpretScore(score)).toBe(verdict);
  });
});
