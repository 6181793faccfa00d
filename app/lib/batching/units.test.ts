import { describe, expect, it } from "vitest";
import { celsiusToFahrenheit, fahrenheitToCelsius, flOzPerCwtToMlPer100kg, ft3ToM3, inToMm, kgPerM3ToLbPerFt3, kgPerM3ToLbPerYd3, lbPerFt3ToKgPerM3, lbPerYd3ToKgPerM3, m3ToFt3, m3ToYd3, mlPer100kgToFlOzPerCwt, mmToIn, yd3ToM3 } from "./units";

describe("unit definitions", () => {
  it("converts lb/yd³ to kg/m³", () => {
    // batching.md check value; exact by definition (NIST SP 811 unit definitions):
    // 0.45359237 kg/lb ÷ 0.764554857984 m³/yd³ = 0.593276… kg/m³
    expect(lbPerYd3ToKgPerM3(1)).toBeCloseTo(0.593276, 6);
    // a paving cement content of 564 lb/yd³ (six-sack), 564 × 0.5932764 = 334.61 kg/m³
    expect(lbPerYd3ToKgPerM3(564)).toBeCloseTo(334.61, 2);
  });

  it("converts yd³ and ft³ to m³", () => {
    // exact by definition (NIST SP 811 unit definitions): 1 yd = 0.9144 m, 1 ft = 0.3048 m
    expect(yd3ToM3(1)).toBeCloseTo(0.764554857984, 12);
    expect(ft3ToM3(1)).toBeCloseTo(0.028316846592, 12);
    expect(m3ToFt3(1)).toBeCloseTo(35.3146667, 6);
    expect(m3ToYd3(1)).toBeCloseTo(1.30795062, 7);
  });

  it("converts admixture dosage fl oz/cwt to mL/100 kg", () => {
    // exact by definition (NIST SP 811 unit definitions): 29.5735295625 mL per US fl oz,
    // 45.359237 kg per cwt → 29.5735295625 / 45.359237 × 100 = 65.1985 mL/100 kg
    expect(flOzPerCwtToMlPer100kg(1)).toBeCloseTo(65.1985, 4);
    expect(mlPer100kgToFlOzPerCwt(65.19847228)).toBeCloseTo(1, 8);
  });

  it("converts inches to millimetres", () => {
    // exact by definition (NIST SP 811 unit definitions): 1 in = 25.4 mm
    expect(inToMm(3)).toBeCloseTo(76.2, 12);
    expect(mmToIn(101.6)).toBeCloseTo(4, 12);
  });

  it("converts temperatures", () => {
    // exact by definition (NIST SP 811 unit definitions): t_C = (t_F − 32)/1.8
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(212)).toBeCloseTo(100, 12);
    expect(fahrenheitToCelsius(-40)).toBeCloseTo(-40, 12);
    expect(celsiusToFahrenheit(23)).toBeCloseTo(73.4, 12);
  });

  it("converts lb/ft³ to kg/m³", () => {
    // exact by definition (NIST SP 811 unit definitions): 0.45359237 / 0.028316846592 = 16.018463 kg/m³
    expect(lbPerFt3ToKgPerM3(1)).toBeCloseTo(16.018463, 6);
    // a unit weight of 145 lb/ft³ is 145 × 16.018463 = 2322.68 kg/m³
    expect(lbPerFt3ToKgPerM3(145)).toBeCloseTo(2322.68, 2);
  });

  it("round-trips every pair", () => {
    const pairs: [(x: number) => number, (x: number) => number][] = [
      [lbPerYd3ToKgPerM3, kgPerM3ToLbPerYd3],
      [lbPerFt3ToKgPerM3, kgPerM3ToLbPerFt3],
      [yd3ToM3, m3ToYd3],
      [ft3ToM3, m3ToFt3],
      [flOzPerCwtToMlPer100kg, mlPer100kgToFlOzPerCwt],
      [inToMm, mmToIn],
      [fahrenheitToCelsius, celsiusToFahrenheit],
    ];
    for (const [there, back] of pairs) expect(back(there(123.456))).toBeCloseTo(123.456, 9);
  });
});
