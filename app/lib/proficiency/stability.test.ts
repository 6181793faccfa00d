import { describe, expect, it } from "vitest";
import { stabilityCheck } from "./stability";

// ISO 13528:2022 B.5: |ȳ₁ − ȳ₂| ≤ 0.3·σ_pt, worked by hand.
describe("stabilityCheck", () => {
  it("passes within 0.3·σ_pt and fails beyond", () => {
    expect(stabilityCheck(12.1, 12.0, 0.5)).toMatchObject({ passes: true });
    const failing = stabilityCheck(12.1, 11.8, 0.5);
    expect(failing.difference).toBeCloseTo(0.3, 12);
    expect(failing.criterion).toBeCloseTo(0.15, 12);
    expect(failing.passes).toBe(false);
  });
});
