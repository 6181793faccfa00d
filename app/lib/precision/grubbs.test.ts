import { mean, sampleStandardDeviation } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { ISO_5725_TABLES } from "../../../tests/fixtures/reference-tables";
import { grubbsDouble, grubbsSingle, grubbsSingleCritical } from "./grubbs";

// ISO 5725-2 Grubbs' single-outlier table, from memory (as listed in the shared reference
// critical-values.md): three-decimal entries agree with the formula within ±0.002.
const THREE_DECIMALS = 0.002;
const ISO_GRUBBS_TABLE = ISO_5725_TABLES.singleGrubbs; // p, 1 %, 5 %

describe("grubbsSingleCritical", () => {
  it.each(ISO_GRUBBS_TABLE)("p = %i matches the ISO 5725-2 table (from memory)", (p, at1, at5) => {
    expect(Math.abs(grubbsSingleCritical(p, 0.01) - at1)).toBeLessThanOrEqual(THREE_DECIMALS);
    expect(Math.abs(grubbsSingleCritical(p, 0.05) - at5)).toBeLessThanOrEqual(THREE_DECIMALS);
  });

  it("refuses fewer than 3 values", () => {
    expect(() => grubbsSingleCritical(2, 0.05)).toThrow(RangeError);
  });
});

describe("grubbsSingle", () => {
  const values = [10.1, 9.9, 10.0, 10.2, 11.5, 9.8];

  it("ISO 5725-2: G = (x_max − x̄)/s and (x̄ − x_min)/s, s from simple-statistics as reference", () => {
    const s = sampleStandardDeviation(values);
    const { high, low } = grubbsSingle(values);
    expect(high.index).toBe(4);
    expect(high.G).toBeCloseTo((11.5 - mean(values)) / s, 13);
    expect(low.index).toBe(5);
    expect(low.G).toBeCloseTo((mean(values) - 9.8) / s, 13);
  });

  it("is undefined when all values are equal", () => {
    expect(grubbsSingle([3, 3, 3]).high.G).toBeNull();
  });
});

describe("grubbsDouble", () => {
  it("ISO 5725-2: sum of squares left without the two extremes over the total", () => {
    // By hand: total sum of squares of 1..6 is 17.5; without 5 and 6 it is that of 1..4, 5;
    // without 1 and 2 that of 3..6, 5.
    const { high, low } = grubbsDouble([3, 1, 6, 2, 5, 4]);
    expect(high.G).toBeCloseTo(5 / 17.5, 14);
    expect(high.indices).toEqual([2, 4]);
    expect(low.G).toBeCloseTo(5 / 17.5, 14);
    expect(low.indices).toEqual([1, 3]);
  });

  it("needs at least 4 values", () => {
    expect(() => grubbsDouble([1, 2, 3])).toThrow(RangeError);
  });
});
