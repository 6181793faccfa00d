import { describe, expect, it } from "vitest";
import { ASTM_E691_TABLES, ISO_5725_TABLES } from "../../../tests/fixtures/reference-tables";
import { hCritical, hStatistic, kCritical, kStatistic } from "./consistency";

// Published tables as listed in the shared reference critical-values.md ("from memory"):
// two-decimal entries agree with the practice's formula within ±0.006.
const TWO_DECIMALS = 0.006;

// ASTM E691 table, from memory: p, h, k (n = 2), k (n = 3) at the 0.5 % significance level.
const E691_TABLE = ASTM_E691_TABLES.hk;

// ISO 5725-2 Mandel's h table, from memory: p, h at 1 %, h at 5 %.
const ISO_H_TABLE = ISO_5725_TABLES.mandelH;

describe("h and k critical values", () => {
  it.each(E691_TABLE)("p = %i matches the ASTM E691 table (from memory) at 0.5 %%", (p, h, k2, k3) => {
    expect(Math.abs(hCritical(p) - h)).toBeLessThanOrEqual(TWO_DECIMALS);
    expect(Math.abs(hCritical(p, 0.005) - h)).toBeLessThanOrEqual(TWO_DECIMALS);
    expect(Math.abs(kCritical(p, 2) - k2)).toBeLessThanOrEqual(TWO_DECIMALS);
    expect(Math.abs(kCritical(p, 3, 0.005) - k3)).toBeLessThanOrEqual(TWO_DECIMALS);
  });

  it.each(ISO_H_TABLE)("p = %i matches the ISO 5725-2 h table (from memory) at 1 %% and 5 %%", (p, h1, h5) => {
    expect(Math.abs(hCritical(p, 0.01) - h1)).toBeLessThanOrEqual(TWO_DECIMALS);
    expect(Math.abs(hCritical(p, 0.05) - h5)).toBeLessThanOrEqual(TWO_DECIMALS);
  });

  it("h is bounded by (p − 1)/√p, the largest |h| any lab can reach (common practice)", () => {
    for (const p of [3, 8, 30]) expect(hCritical(p)).toBeLessThan((p - 1) / Math.sqrt(p));
  });

  it("k grows towards √p, the largest k any lab can reach (common practice)", () => {
    expect(kCritical(8, 2)).toBeGreaterThan(kCritical(8, 5));
    expect(kCritical(8, 2)).toBeLessThan(Math.sqrt(8));
  });

  it("refuses too few labs or replicates and unsupported significance levels", () => {
    expect(() => hCritical(2)).toThrow(RangeError);
    expect(() => kCritical(4, 1)).toThrow(RangeError);
    expect(() => hCritical(5, 0.1)).toThrow(/0\.005, 0\.01, 0\.05/);
  });
});

describe("h and k statistics", () => {
  it("ASTM E691: h = d/s_x̄ and k = s/s_r, undefined without spread", () => {
    expect(hStatistic(-0.6, 0.3)).toBeCloseTo(-2, 14);
    expect(kStatistic(0.45, 0.3)).toBeCloseTo(1.5, 14);
    expect(hStatistic(0.1, 0)).toBeNull();
    expect(kStatistic(0.1, 0)).toBeNull();
  });
});
