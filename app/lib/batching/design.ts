import type {
  Aggregate,
  BatchingWarning,
  Constituent,
  MixtureDesign,
  PowderOrWater,
} from "./types";

/**
 * Density of water that turns relative density into absolute volume, kg/m³
 * (common practice: 1000 kg/m³, the reference of the relative densities).
 */
export const WATER_DENSITY_KG_PER_M3 = 1000;

/** How far the absolute volume may stray from 1.000 m³ before a warning, as a fraction. */
export const ABSOLUTE_VOLUME_TOLERANCE = 0.005;

/** Rows that are weighed and have a relative density. */
export function isMassConstituent(c: Constituent): c is PowderOrWater | Aggregate {
  return "ssdMassKgPerM3" in c;
}

export function isAggregate(c: Constituent): c is Aggregate {
  return c.kind === "coarse_aggregate" || c.kind === "fine_aggregate";
}

function sumMass(design: MixtureDesign, kinds: readonly Constituent["kind"][]): number {
  return design.constituents
    .filter(isMassConstituent)
    .filter((c) => kinds.includes(c.kind))
    .reduce((sum, c) => sum + c.ssdMassKgPerM3, 0);
}

/** Total cementitious content = cement + SCMs, kg/m³ (common practice). */
export function totalCementitiousKgPerM3(design: MixtureDesign): number {
  return sumMass(design, ["cement", "scm"]);
}

/** Mixing water of the design, kg/m³ (SSD basis: excludes water absorbed by aggregate). */
export function designWaterKgPerM3(design: MixtureDesign): number {
  return sumMass(design, ["water"]);
}

/**
 * Water–cementitious ratio w/cm = water / (cement + SCMs), by mass
 * (common practice). Null when the design has no cementitious material.
 */
export function waterCementitiousRatio(design: MixtureDesign): number | null {
  const cementitious = totalCementitiousKgPerM3(design);
  return cementitious > 0 ? designWaterKgPerM3(design) / cementitious : null;
}

/**
 * SCM replacement = SCMs / (cement + SCMs) × 100, % by mass of total
 * cementitious (common practice). Null when there is no cementitious material.
 */
export function scmReplacementPercent(design: MixtureDesign): number | null {
  const cementitious = totalCementitiousKgPerM3(design);
  return cementitious > 0 ? (sumMass(design, ["scm"]) / cementitious) * 100 : null;
}

/**
 * Absolute volume of one row per m³ of concrete (absolute volume method,
 * common practice): mass / (SG × ρ_water) for weighed rows, the volume
 * fraction for fiber and air. Admixtures count 0: at usual dosages they are
 * a few litres per m³ and common practice leaves them out.
 */
export function constituentAbsoluteVolumeM3(c: Constituent): number {
  switch (c.kind) {
    case "admixture":
      return 0;
    case "fiber":
      return c.volumeFractionPercent / 100;
    case "air":
      return c.airContentPercent / 100;
    default:
      return c.ssdMassKgPerM3 / (c.relativeDensity * WATER_DENSITY_KG_PER_M3);
  }
}

export interface AbsoluteVolumeRow {
  index: number;
  kind: Constituent["kind"];
  name: string;
  volumeM3: number;
}

export interface AbsoluteVolume {
  rows: AbsoluteVolumeRow[];
  /** Σ of the rows, m³ per m³ of concrete; 1.000 for a closed design. */
  totalM3: number;
}

/** Absolute volume Σ mass/(SG·ρ_water) + air + fiber, per m³ (common practice). */
export function absoluteVolume(design: MixtureDesign): AbsoluteVolume {
  const rows = design.constituents.map((c, index) => ({
    index,
    kind: c.kind,
    name: c.name,
    volumeM3: constituentAbsoluteVolumeM3(c),
  }));
  return { rows, totalM3: rows.reduce((sum, r) => sum + r.volumeM3, 0) };
}

export interface MixtureDesignCheck {
  absoluteVolume: AbsoluteVolume;
  totalCementitiousKgPerM3: number;
  waterCementitiousRatio: number | null;
  scmReplacementPercent: number | null;
  warnings: BatchingWarning[];
}

/** The figures a coordinator checks before shipping a design, with warnings to show. */
export function checkMixtureDesign(design: MixtureDesign): MixtureDesignCheck {
  const volume = absoluteVolume(design);
  const wcm = waterCementitiousRatio(design);
  const warnings: BatchingWarning[] = [];
  const deviation = volume.totalM3 - 1;
  if (Math.abs(deviation) > ABSOLUTE_VOLUME_TOLERANCE) {
    warnings.push({
      code: "absolute_volume",
      message:
        `The constituents add up to ${volume.totalM3.toFixed(3)} m³ per m³ ` +
        `(${deviation > 0 ? "+" : ""}${(deviation * 100).toFixed(1)} %); ` +
        "adjust the masses until the absolute volume is within ±0.5 % of 1.000 m³.",
    });
  }
  if (wcm === null) {
    warnings.push({
      code: "no_cementitious",
      message: "The design has no cement or SCM, so w/cm and SCM replacement cannot be computed.",
    });
  }
  return {
    absoluteVolume: volume,
    totalCementitiousKgPerM3: totalCementitiousKgPerM3(design),
    waterCementitiousRatio: wcm,
    scmReplacementPercent: scmReplacementPercent(design),
    warnings,
  };
}
