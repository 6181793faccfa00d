import { isAggregate, isMassConstituent, totalCementitiousKgPerM3 } from "./design";
import type { BatchingWarning, ConstituentKind, MixtureDesign } from "./types";

// Moisture corrections of the SSD design to stockpile aggregate (common
// practice). MC and Abs are both % of oven-dry mass, so the oven-dry mass
// is the common base of every formula below.

/** Oven-dry mass OD = SSD / (1 + Abs), kg (common practice). */
export function ovenDryMassKg(ssdMassKg: number, absorptionPercent: number): number {
  return ssdMassKg / (1 + absorptionPercent / 100);
}

/** Wet batch mass = OD × (1 + MC) = SSD × (1 + MC)/(1 + Abs), kg (common practice). */
export function wetBatchMassKg(
  ssdMassKg: number,
  moistureContentPercent: number,
  absorptionPercent: number,
): number {
  return ovenDryMassKg(ssdMassKg, absorptionPercent) * (1 + moistureContentPercent / 100);
}

/**
 * Free water carried by the aggregate = SSD × (MC − Abs)/(1 + Abs), kg
 * (common practice). Negative when the aggregate is drier than SSD: it
 * will absorb that much of the mixing water.
 */
export function freeWaterKg(
  ssdMassKg: number,
  moistureContentPercent: number,
  absorptionPercent: number,
): number {
  return (
    ovenDryMassKg(ssdMassKg, absorptionPercent) *
    ((moistureContentPercent - absorptionPercent) / 100)
  );
}

/** Admixture volume = dosage (mL/100 kg) × cementitious mass (kg) / 100, mL (common practice). */
export function admixtureVolumeMl(dosageMlPer100kg: number, cementitiousKg: number): number {
  return (dosageMlPer100kg * cementitiousKg) / 100;
}

/** Fiber mass = volume fraction × fiber density × V, kg (common practice). */
export function fiberMassKg(
  volumeFractionPercent: number,
  fiberDensityKgPerM3: number,
  volumeM3: number,
): number {
  return (volumeFractionPercent / 100) * fiberDensityKgPerM3 * volumeM3;
}

export interface BatchSheetInput {
  /** Batch volume V, m³. */
  batchVolumeM3: number;
  /** Stockpile moisture content MC, % of oven-dry mass, keyed by the aggregate's row index in the design. */
  moistureContentPercent: Record<number, number>;
}

export interface AggregateCorrection {
  ssdMassKg: number;
  ovenDryMassKg: number;
  moistureContentPercent: number;
  absorptionPercent: number;
  freeWaterKg: number;
}

export interface WaterCorrection {
  designWaterKg: number;
  /** Σ free water of the aggregates, subtracted from the design water. */
  freeWaterFromAggregatesKg: number;
}

export interface BatchSheetRow {
  /** Row index in the mixture design. */
  index: number;
  kind: Exclude<ConstituentKind, "air">;
  name: string;
  lot?: string;
  /** What to weigh or measure out for this batch. */
  amount: number;
  unit: "kg" | "mL";
  aggregate?: AggregateCorrection;
  water?: WaterCorrection;
}

export interface BatchSheet {
  batchVolumeM3: number;
  /** Air is not batched, so it has no row; its target stays with the design. */
  rows: BatchSheetRow[];
  cementitiousKg: number;
  /** Σ of the rows weighed in kg. */
  totalMassKg: number;
  warnings: BatchingWarning[];
}

/**
 * Batch sheet for volume V: every design quantity × V, aggregates weighed
 * wet at the day's moisture, and batch water = design water × V − Σ free
 * water (common practice). Throws on inputs a form should have refused.
 */
export function batchSheet(design: MixtureDesign, input: BatchSheetInput): BatchSheet {
  const v = input.batchVolumeM3;
  if (!(Number.isFinite(v) && v > 0)) {
    throw new RangeError("Batch volume must be a positive number of m³");
  }
  const waterRows = design.constituents.filter((c) => c.kind === "water");
  if (waterRows.length !== 1) {
    throw new RangeError("A batch sheet needs exactly one water row in the mixture design");
  }
  const cementitiousKg = totalCementitiousKgPerM3(design) * v;

  const rows: BatchSheetRow[] = [];
  let waterRowAt = -1;
  let freeWaterTotal = 0;
  design.constituents.forEach((c, index) => {
    const base = { index, name: c.name, ...(c.lot === undefined ? {} : { lot: c.lot }) };
    if (isAggregate(c)) {
      const mc = input.moistureContentPercent[index];
      if (mc === undefined || !Number.isFinite(mc) || mc < 0) {
        throw new RangeError(`Moisture content of ${c.name} must be a number of at least 0 %`);
      }
      const ssd = c.ssdMassKgPerM3 * v;
      const free = freeWaterKg(ssd, mc, c.absorptionPercent);
      freeWaterTotal += free;
      rows.push({
        ...base,
        kind: c.kind,
        amount: wetBatchMassKg(ssd, mc, c.absorptionPercent),
        unit: "kg",
        aggregate: {
          ssdMassKg: ssd,
          ovenDryMassKg: ovenDryMassKg(ssd, c.absorptionPercent),
          moistureContentPercent: mc,
          absorptionPercent: c.absorptionPercent,
          freeWaterKg: free,
        },
      });
    } else if (isMassConstituent(c)) {
      if (c.kind === "water") waterRowAt = rows.length;
      rows.push({ ...base, kind: c.kind, amount: c.ssdMassKgPerM3 * v, unit: "kg" });
    } else if (c.kind === "admixture") {
      rows.push({
        ...base,
        kind: c.kind,
        amount: admixtureVolumeMl(c.dosagePer100kgCementitious, cementitiousKg),
        unit: "mL",
      });
    } else if (c.kind === "fiber") {
      rows.push({
        ...base,
        kind: c.kind,
        amount: fiberMassKg(c.volumeFractionPercent, c.fiberDensity, v),
        unit: "kg",
      });
    }
  });

  // Free water is only known once every aggregate is seen.
  const waterRow = rows[waterRowAt];
  const designWaterKg = waterRow.amount;
  waterRow.amount = designWaterKg - freeWaterTotal;
  waterRow.water = { designWaterKg, freeWaterFromAggregatesKg: freeWaterTotal };

  const warnings: BatchingWarning[] = [];
  if (waterRow.amount < 0) {
    warnings.push({
      code: "aggregate_too_wet",
      message:
        `The aggregates carry ${freeWaterTotal.toFixed(2)} kg of free water, more than the ` +
        `${designWaterKg.toFixed(2)} kg the batch needs; let the stockpile drain before batching.`,
    });
  }
  return {
    batchVolumeM3: v,
    rows,
    cementitiousKg,
    totalMassKg: rows.filter((r) => r.unit === "kg").reduce((sum, r) => sum + r.amount, 0),
    warnings,
  };
}
