import { describe, expect, it } from "vitest";
import { FLOAT_FINISHING_SPECIMEN_M3, suggestBatchVolume } from "./batch-volume";
import { M3_PER_FT3, MM_PER_IN } from "./units";

describe("float finishing specimen", () => {
  it("is 3 ft × 2 ft × 3 in = 1.5 ft³ = 0.0425 m³", () => {
    // batching.md check value; common practice form size, exact by definition
    // (NIST SP 811 unit definitions): 3 in = 76.2 mm = 0.25 ft
    const depthFt = (3 * MM_PER_IN) / 304.8;
    expect(3 * 2 * depthFt).toBeCloseTo(1.5, 12);
    // 1.5 × 0.028316846592 = 0.042475 m³, which rounds to the 0.0425 m³ of the trade
    expect(1.5 * M3_PER_FT3).toBeCloseTo(0.042475, 6);
    expect(FLOAT_FINISHING_SPECIMEN_M3).toBeCloseTo(1.5 * M3_PER_FT3, 4);
  });
});

describe("suggested batch volume", () => {
  it("shows the arithmetic with the defaults", () => {
    // common practice arithmetic, our defaults (10 % waste, 0.010 m³ for fresh tests):
    // 2 × 0.0425 = 0.085; × 1.10 = 0.0935; + 0.010 = 0.1035 m³
    const s = suggestBatchVolume({ specimens: 2 });
    expect(s.volumeM3).toBeCloseTo(0.1035, 10);
    expect(s.summary).toBe("2 specimens × 0.0425 m³ × 1.10 + 0.010 m³ = 0.1035 m³");
    expect(s.steps).toEqual([
      { text: "2 specimens × 0.0425 m³ = 0.085 m³", valueM3: expect.closeTo(0.085, 10) },
      { text: "0.085 m³ × 1.10 (10 % waste) = 0.0935 m³", valueM3: expect.closeTo(0.0935, 10) },
      {
        text: "0.0935 m³ + 0.010 m³ (fresh tests) = 0.1035 m³",
        valueM3: expect.closeTo(0.1035, 10),
      },
    ]);
  });

  it("takes the study's own waste, allowance and specimen", () => {
    // invented study settings: 1 specimen of 0.030 m³, 15 % waste, 0.020 m³ allowance;
    // 0.030 × 1.15 + 0.020 = 0.0545 m³
    const s = suggestBatchVolume({
      specimens: 1,
      specimenVolumeM3: 0.03,
      wasteFraction: 0.15,
      freshTestAllowanceM3: 0.02,
    });
    expect(s.volumeM3).toBeCloseTo(0.0545, 10);
    expect(s.summary).toBe("1 specimen × 0.030 m³ × 1.15 + 0.020 m³ = 0.0545 m³");
    expect(s.steps[1].text).toBe("0.030 m³ × 1.15 (15 % waste) = 0.0345 m³");
  });

  it("refuses a fractional or zero number of specimens", () => {
    expect(() => suggestBatchVolume({ specimens: 0 })).toThrow(RangeError);
    expect(() => suggestBatchVolume({ specimens: 2.5 })).toThrow(RangeError);
    expect(() => suggestBatchVolume({ specimens: 2, wasteFraction: -0.1 })).toThrow(RangeError);
  });
});
