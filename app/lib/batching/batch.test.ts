import { describe, expect, it } from "vitest";
import { admixtureVolumeMl, batchSheet, fiberMassKg, freeWaterKg, ovenDryMassKg, wetBatchMassKg } from "./batch";
import { inventedPavingMix } from "./paving.fixture";

describe("moisture correction", () => {
  it("wet aggregate: SSD 1000 kg, MC 3 %, Abs 1 %", () => {
    // batching.md check value, common practice arithmetic: 1000 × 1.03/1.01, 1000 × 0.02/1.01
    expect(wetBatchMassKg(1000, 3, 1)).toBeCloseTo(1019.8, 2);
    expect(freeWaterKg(1000, 3, 1)).toBeCloseTo(19.8, 2);
    // common practice arithmetic: OD = 1000 / 1.01
    expect(ovenDryMassKg(1000, 1)).toBeCloseTo(990.099, 3);
  });

  it("dry aggregate: SSD 1000 kg, MC 0.5 %, Abs 1 %", () => {
    // batching.md check value, common practice arithmetic: 1000 × 1.005/1.01, 1000 × (−0.005)/1.01
    expect(wetBatchMassKg(1000, 0.5, 1)).toBeCloseTo(995.05, 2);
    expect(freeWaterKg(1000, 0.5, 1)).toBeCloseTo(-4.95, 2);
  });

  it("SSD aggregate carries no free water", () => {
    // common practice: at MC = Abs the aggregate is saturated surface-dry
    expect(wetBatchMassKg(500, 1.2, 1.2)).toBeCloseTo(500, 12);
    expect(freeWaterKg(500, 1.2, 1.2)).toBe(0);
  });
});

describe("admixture and fiber", () => {
  it("doses admixture on the cementitious mass", () => {
    // common practice arithmetic: 650 mL/100 kg × 36.225 kg / 100 = 235.4625 mL
    expect(admixtureVolumeMl(650, 36.225)).toBeCloseTo(235.4625, 6);
  });

  it("0.5 % by volume of polypropylene at 910 kg/m³ is 4.55 kg/m³", () => {
    // batching.md check value, common practice arithmetic: 0.005 × 910 × 1 m³
    expect(fiberMassKg(0.5, 910, 1)).toBeCloseTo(4.55, 10);
    // scaled to a 0.1035 m³ batch: 4.55 × 0.1035 = 0.470925 kg
    expect(fiberMassKg(0.5, 910, 0.1035)).toBeCloseTo(0.470925, 8);
  });
});

describe("batch sheet of the invented paving mixture", () => {
  // invented day's moisture: coarse 1.5 % (Abs 0.8 %), fine 4.0 % (Abs 1.2 %); V = 0.1035 m³
  const sheet = batchSheet(inventedPavingMix, {
    batchVolumeM3: 0.1035,
    moistureContentPercent: { 3: 1.5, 4: 4 },
  });
  const row = (name: string) => sheet.rows.find((r) => r.name === name)!;

  it("scales cement and SCM by V", () => {
    // common practice arithmetic: 280 × 0.1035 = 28.98 kg, 70 × 0.1035 = 7.245 kg, Σ 36.225 kg
    expect(row("Type I/II portland cement")).toMatchObject({
      amount: expect.closeTo(28.98, 6),
      unit: "kg",
      lot: "C-24-117",
    });
    expect(row("Class F fly ash").amount).toBeCloseTo(7.245, 6);
    expect(sheet.cementitiousKg).toBeCloseTo(36.225, 6);
  });

  it.each([
    // common practice arithmetic, coarse: SSD 1100 × 0.1035 = 113.85 kg;
    // wet 113.85 × 1.015/1.008 = 114.6406 kg; free 113.85 × 0.007/1.008 = 0.7906 kg
    { name: "No. 57 crushed limestone", wetKg: 114.6406, freeWaterKg: 0.7906 },
    // fine: SSD 720 × 0.1035 = 74.52 kg; wet 74.52 × 1.04/1.012 = 76.5818 kg;
    // free 74.52 × 0.028/1.012 = 2.0618 kg
    { name: "Natural concrete sand", wetKg: 76.5818, freeWaterKg: 2.0618 },
  ])("weighs the $name wet and credits its free water", ({ name, wetKg, freeWaterKg }) => {
    expect(row(name).amount).toBeCloseTo(wetKg, 4);
    expect(row(name).aggregate?.freeWaterKg).toBeCloseTo(freeWaterKg, 4);
  });

  it("keeps the aggregate's SSD and oven-dry masses and its moisture on the sheet", () => {
    // common practice arithmetic, coarse: SSD 1100 × 0.1035 = 113.85 kg; OD 113.85/1.008 = 112.9464 kg
    expect(row("No. 57 crushed limestone").aggregate).toMatchObject({
      ssdMassKg: expect.closeTo(113.85, 6),
      ovenDryMassKg: expect.closeTo(112.9464, 4),
      moistureContentPercent: 1.5,
      absorptionPercent: 0.8,
    });
  });

  it("takes the free water off the batch water", () => {
    // common practice arithmetic: 140 × 0.1035 = 14.49 kg; 14.49 − (0.7906 + 2.0618) = 11.6376 kg
    const water = row("Potable water");
    expect(water.amount).toBeCloseTo(11.6376, 4);
    expect(water.water).toEqual({
      designWaterKg: expect.closeTo(14.49, 6),
      freeWaterFromAggregatesKg: expect.closeTo(2.8524, 4),
    });
    expect(sheet.warnings).toEqual([]);
  });

  it("measures admixtures in mL on the batch's cementitious mass and leaves air unbatched", () => {
    // common practice arithmetic: 30 × 36.225/100 = 10.8675 mL; 300 × 36.225/100 = 108.675 mL
    expect(row("Air-entraining admixture")).toMatchObject({
      amount: expect.closeTo(10.8675, 6),
      unit: "mL",
    });
    expect(row("Water-reducing admixture").amount).toBeCloseTo(108.675, 6);
    expect(sheet.rows.map((r) => r.kind)).not.toContain("air");
    expect(sheet.rows).toHaveLength(7);
  });

  it("adds up the weighed mass", () => {
    // 28.98 + 7.245 + 11.6376 + 114.6406 + 76.5818 = 239.0850 kg (admixtures are in mL)
    expect(sheet.totalMassKg).toBeCloseTo(239.085, 3);
  });
});

describe("batch sheet guards", () => {
  it("warns when the aggregate brings more water than the batch needs", () => {
    // invented soaked sand: MC 20 %, Abs 1.2 % → free 74.52 × 0.188/1.012 = 13.8436 kg,
    // plus coarse 0.7906 kg > 14.49 kg design water → batch water 14.49 − 14.6343 = −0.1443 kg
    const sheet = batchSheet(inventedPavingMix, {
      batchVolumeM3: 0.1035,
      moistureContentPercent: { 3: 1.5, 4: 20 },
    });
    expect(sheet.rows.find((r) => r.kind === "water")?.amount).toBeCloseTo(-0.1443, 4);
    expect(sheet.warnings.map((w) => w.code)).toEqual(["aggregate_too_wet"]);
  });

  it("weighs a fiber by its volume fraction of the batch", () => {
    // invented fibered variant; batching.md check value 4.55 kg/m³ × 0.1035 m³ = 0.470925 kg
    const fibered = {
      ...inventedPavingMix,
      constituents: [
        ...inventedPavingMix.constituents,
        {
          kind: "fiber" as const,
          name: "Polypropylene macrofiber",
          volumeFractionPercent: 0.5,
          fiberDensity: 910,
        },
      ],
    };
    const sheet = batchSheet(fibered, {
      batchVolumeM3: 0.1035,
      moistureContentPercent: { 3: 0.8, 4: 1.2 },
    });
    expect(sheet.rows.find((r) => r.kind === "fiber")).toMatchObject({
      amount: expect.closeTo(0.470925, 8),
      unit: "kg",
    });
  });

  it("refuses a design without exactly one water row", () => {
    const dry = {
      ...inventedPavingMix,
      constituents: inventedPavingMix.constituents.filter((c) => c.kind !== "water"),
    };
    expect(() =>
      batchSheet(dry, { batchVolumeM3: 0.1, moistureContentPercent: { 2: 1, 3: 1 } }),
    ).toThrow("A batch sheet needs exactly one water row in the mixture design");
  });

  it("refuses a missing moisture content or a non-positive volume", () => {
    expect(() =>
      batchSheet(inventedPavingMix, { batchVolumeM3: 0.1, moistureContentPercent: { 3: 1.5 } }),
    ).toThrow("Moisture content of Natural concrete sand must be a number of at least 0 %");
    expect(() =>
      batchSheet(inventedPavingMix, { batchVolumeM3: 0, moistureContentPercent: { 3: 1, 4: 1 } }),
    ).toThrow("Batch volume must be a positive number of m³");
  });
});
