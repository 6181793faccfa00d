import { describe, expect, it } from "vitest";
import { halfNormalPoints } from "./half-normal";

describe("halfNormalPoints", () => {
  it("orders absolute effects and gives half-normal quantiles at (i − 0.5)/m", () => {
    const points = halfNormalPoints([
      { label: "A", effect: -3 },
      { label: "B", effect: 0.5 },
    ]);
    expect(points.map((p) => p.label)).toEqual(["B", "A"]);
    expect(points[1]!.absoluteEffect).toBe(3);
    // Φ⁻¹(0.625) = 0.3186 and Φ⁻¹(0.875) = 1.1503, standard normal table (from memory)
    expect(points[0]!.quantile).toBeCloseTo(0.3186, 4);
    expect(points[1]!.quantile).toBeCloseTo(1.1503, 4);
  });

  it("for a single effect sits at the median of |Z|, Φ⁻¹(0.75) = 0.6745 (normal table)", () => {
    expect(halfNormalPoints([{ label: "A", effect: 1 }])[0]!.quantile).toBeCloseTo(0.6745, 4);
  });
});
