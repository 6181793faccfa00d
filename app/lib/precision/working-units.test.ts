import { describe, expect, it } from "vitest";
import { workingUnits } from "./working-units";

describe("workingUnits", () => {
  it("takes the midrange as origin and a power of two as scale", () => {
    const values = [1e9 + 1, 1e9 + 2, 1e9 + 3, 1e9 + 5];
    expect(workingUnits(values, [{ start: 0, count: 4 }])).toEqual({ origin: 1e9 + 3, scale: 2 });
  });

  it("keeps tiny spreads away from underflow", () => {
    const { scale } = workingUnits([1e-200, 2e-200, 3e-200], [{ start: 0, count: 3 }]);
    expect(scale).toBe(2 ** Math.floor(Math.log2(1e-200)));
  });

  it("uses scale 1 when every value is equal", () => {
    expect(workingUnits([4, 4], [{ start: 0, count: 2 }])).toEqual({ origin: 4, scale: 1 });
  });
});
