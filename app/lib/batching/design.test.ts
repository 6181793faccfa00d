import { describe, expect, it } from "vitest";
import { absoluteVolume, checkMixtureDesign, constituentAbsoluteVolumeM3, scmReplacementPercent, totalCementitiousKgPerM3, waterCementitiousRatio } from "./design";
import { inventedPavingMix } from "./paving.fixture";
import type { MixtureDesign } from "./types";

describe("invented paving mixture", () => {
  it("closes to 1.000 m³ within ±0.5 %", () => {
    // common practice arithmetic, mass / (SG × 1000):
    // cement 280/3150 = 0.08889, fly ash 70/2500 = 0.02800, water 140/1000 = 0.14000,
    // coarse 1100/2700 = 0.40741, fine 720/2620 = 0.27481, air 0.06000 → 0.99911 m³
    const volume = absoluteVolume(inventedPavingMix);
    expect(volume.totalM3).toBeCloseTo(0.99911, 5);
    expect(volume.rows.map((r) => r.volumeM3)).toEqual([
      expect.closeTo(0.08889, 5),
      expect.closeTo(0.028, 5),
      expect.closeTo(0.14, 5),
      expect.closeTo(0.40741, 5),
      expect.closeTo(0.27481, 5),
      0,
      0,
      expect.closeTo(0.06, 5),
    ]);
    expect(checkMixtureDesign(inventedPavingMix).warnings).toEqual([]);
  });

  it("has w/cm 0.40 and 20 % SCM", () => {
    // common practice arithmetic: cementitious 280 + 70 = 350 kg/m³;
    // w/cm = 140 / 350 = 0.40; SCM = 70 / 350 = 20 %
    expect(totalCementitiousKgPerM3(inventedPavingMix)).toBe(350);
    expect(waterCementitiousRatio(inventedPavingMix)).toBeCloseTo(0.4, 12);
    expect(scmReplacementPercent(inventedPavingMix)).toBeCloseTo(20, 12);
    const check = checkMixtureDesign(inventedPavingMix);
    expect(check.waterCementitiousRatio).toBeCloseTo(0.4, 12);
    expect(check.scmReplacementPercent).toBeCloseTo(20, 12);
    expect(check.totalCementitiousKgPerM3).toBe(350);
  });
});

describe("absolute volume", () => {
  const withSand = (kg: number): MixtureDesign => ({
    ...inventedPavingMix,
    constituents: inventedPavingMix.constituents.map((c) =>
      c.kind === "fine_aggregate" ? { ...c, ssdMassKgPerM3: kg } : c,
    ),
  });

  it("counts a fiber by its volume fraction", () => {
    // common practice: 0.5 % by volume occupies 0.005 m³ per m³
    expect(
      constituentAbsoluteVolumeM3({
        kind: "fiber",
        name: "Polypropylene macrofiber",
        volumeFractionPercent: 0.5,
        fiberDensity: 910,
      }),
    ).toBeCloseTo(0.005, 12);
  });

  it("warns when the design does not close within ±0.5 %", () => {
    // invented: 40 kg more sand adds 40/2620 = 0.01527 m³ → 0.99911 + 0.01527 = 1.01437 m³, +1.4 %
    const check = checkMixtureDesign(withSand(760));
    expect(check.absoluteVolume.totalM3).toBeCloseTo(1.01437, 5);
    expect(check.warnings).toEqual([
      {
        code: "absolute_volume",
        message:
          "The constituents add up to 1.014 m³ per m³ (+1.4 %); adjust the masses until the " +
          "absolute volume is within ±0.5 % of 1.000 m³.",
      },
    ]);
  });

  it("accepts a design 0.4 % short but not one 0.6 % short", () => {
    // ±0.5 % closure (batching.md); invented sand masses either side of the edge:
    // 0.72430 m³ without sand; 712/2620 = 0.27176 → 0.99605 m³ (−0.39 %),
    // 706/2620 = 0.26947 → 0.99376 m³ (−0.62 %)
    expect(checkMixtureDesign(withSand(712)).warnings).toEqual([]);
    expect(checkMixtureDesign(withSand(706)).warnings.map((w) => w.code)).toEqual([
      "absolute_volume",
    ]);
  });
});

describe("ratios without cementitious material", () => {
  it("reports null and a warning instead of dividing by zero", () => {
    const waterOnly: MixtureDesign = {
      name: "Incomplete (invented)",
      constituents: [{ kind: "water", name: "Water", ssdMassKgPerM3: 1000, relativeDensity: 1 }],
    };
    const check = checkMixtureDesign(waterOnly);
    expect(check.waterCementitiousRatio).toBeNull();
    expect(check.scmReplacementPercent).toBeNull();
    expect(check.warnings.map((w) => w.code)).toEqual(["no_cementitious"]);
  });
});
