import { describe, expect, it } from "vitest";
import { celsiusToFahrenheit, fahrenheitToCelsius, flOzPerCwtToMlPer100kg, ft3ToM3, inToMm, kgPerM3ToLbPerFt3, kgPerM3ToLbPerYd3, lbPerFt3ToKgPerM3, lbPerYd3ToKgPerM3, m3ToFt3, m3ToYd3, mlPer100kgToFlOzPerCwt, mmToIn, yd3ToM3 } from "./units";

describe("unit definitions", () => {
  it.each([
    // batching.md check value; exact by definition (NIST SP 811 unit definitions):
    // 0.45359237 kg/lb ÷ 0.764554857984 m³/yd³ = 0.593276… kg/m³
    { convert: lbPerYd3ToKgPerM3, value: 1, expected: 0.593276, digits: 6 },
    // exact by definition (NIST SP 811 unit definitions): 0.45359237 / 0.028316846592 = 16.018463 kg/m³
    { convert: lbPerFt3ToKgPerM3, value: 1, expected: 16.018463, digits: 6 },
    // exact by definition (NIST SP 811 unit definitions): 1 yd = 0.9144 m, 1 ft = 0.3048 m
    { convert: yd3ToM3, value: 1, expected: 0.764554857984, digits: 12 },
    { convert: ft3ToM3, value: 1, expected: 0.028316846592, digits: 12 },
    { convert: m3ToFt3, value: 1, expected: 35.3146667, digits: 6 },
    { convert: m3ToYd3, value: 1, expected: 1.30795062, digits: 7 },
    // exact by definition (NIST SP 811 unit definitions): 29.5735295625 mL per US fl oz,
    // 45.359237 kg per cwt → 29.5735295625 / 45.359237 × 100 = 65.1985 mL/100 kg
    { convert: flOzPerCwtToMlPer100kg, value: 1, expected: 65.1985, digits: 4 },
    { convert: mlPer100kgToFlOzPerCwt, value: 65.19847228, expected: 1, digits: 8 },
    // exact by definition (NIST SP 811 unit definitions): 1 in = 25.4 mm
    { convert: inToMm, value: 3, expected: 76.2, digits: 12 },
    { convert: mmToIn, value: 101.6, expected: 4, digits: 12 },
  ])("$convert.name($value) ≈ $expected by the unit definitions", ({ convert, value, expected, digits }) => {
    expect(convert(value)).toBeCloseTo(expected, digits);
  });

  it("converts the trade's familiar quantities", () => {
    // a paving cement content of 564 lb/yd³ (six-sack), 564 × 0.5932764 = 334.61 kg/m³
    expect(lbPerYd3ToKgPerM3(564)).toBeCloseTo(334.61, 2);
    // a unit weight of 145 lb/ft³ is 145 × 16.018463 = 2322.68 kg/m³
    expect(lbPerFt3ToKgPerM3(145)).toBeCloseTo(2322.68, 2);
  });

  it("converts temperatures", () => {
    // exact by definition (NIST SP 811 unit definitions): t_C = (t_F − 32)/1.8
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(212)).toBeCloseTo(100, 12);
    expect(fahrenheitToCelsius(-40)).toBeCloseTo(-40, 12);
    expect(celsiusToFahrenheit(23)).toBeCloseTo(73.4, 12);
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
