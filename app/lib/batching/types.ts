/**
 * Mixture design types. A design is stated per 1 m³ of concrete, SSD basis
 * (aggregates saturated surface-dry), as in the absolute volume method of
 * mixture proportioning (common practice). US customary designs are
 * converted to SI with ./units before they reach these types.
 */

export type ConstituentKind =
  | "cement"
  | "scm"
  | "water"
  | "coarse_aggregate"
  | "fine_aggregate"
  | "admixture"
  | "fiber"
  | "air";

interface ConstituentBase {
  /** Trade or product name as shipped, e.g. "Type I/II portland cement". */
  name: string;
  /** Lot or batch number of the shipped material, so every lab uses the same one. */
  lot?: string;
}

/** Cement, supplementary cementitious material (SCM) or mixing water. */
export interface PowderOrWater extends ConstituentBase {
  kind: "cement" | "scm" | "water";
  /** Mass per m³ of concrete, kg/m³. */
  ssdMassKgPerM3: number;
  /** Relative density (specific gravity), dimensionless; 1.00 for water. */
  relativeDensity: number;
}

/** Coarse or fine aggregate, proportioned saturated surface-dry. */
export interface Aggregate extends ConstituentBase {
  kind: "coarse_aggregate" | "fine_aggregate";
  /** SSD mass per m³ of concrete, kg/m³. */
  ssdMassKgPerM3: number;
  /** Relative density (specific gravity) on the SSD basis, dimensionless. */
  relativeDensity: number;
  /** Absorption, % of oven-dry mass. */
  absorptionPercent: number;
}

/** Chemical admixture, dosed on the cementitious content. */
export interface Admixture extends ConstituentBase {
  kind: "admixture";
  /** Dosage in mL per 100 kg of cementitious material (cement + SCMs). */
  dosagePer100kgCementitious: number;
}

/** Fiber, proportioned by volume of concrete. */
export interface Fiber extends ConstituentBase {
  kind: "fiber";
  /** Fiber volume, % of the concrete volume. */
  volumeFractionPercent: number;
  /** Density of the fiber material, kg/m³ (e.g. polypropylene about 910). */
  fiberDensity: number;
}

/** Entrapped plus entrained air of the design. */
export interface Air extends ConstituentBase {
  kind: "air";
  /** Air content, % of the concrete volume. */
  airContentPercent: number;
}

export type Constituent = PowderOrWater | Aggregate | Admixture | Fiber | Air;

/** One test material of a study: its constituents per 1 m³ of concrete. */
export interface MixtureDesign {
  name: string;
  constituents: Constituent[];
}

/** A message a page can show next to a computed figure. */
export interface BatchingWarning {
  code: string;
  message: string;
}
