import type { C670Form } from "./c670-form";
import type { LevelFitResult, LevelPoint } from "./level-fit";
import type { OutlierClass } from "./outlier-class";
import type { SignificanceLevel } from "./significance";

export type ResponseKind = "count" | "continuous";

/** One test result in long form. */
export interface ResultRow {
  lab: string;
  material: string;
  response: string;
  /** replicate number within the cell, a whole number ≥ 1 */
  replicate: number;
  value: number;
  /** source row number (a CSV's header is row 1), quoted in problems */
  row?: number;
}

/** A coordinator's decision to leave one lab × material × response cell out. */
export interface ExcludedCell {
  lab: string;
  material: string;
  response: string;
  reason: string;
}

export interface StudyOptions {
  /** significance level of the h and k critical values: 0.005 (default, ASTM E691), 0.01 or 0.05 (ISO 5725-2) */
  alpha?: number;
  excludedCells?: readonly ExcludedCell[];
  /** responses not listed are continuous */
  responseKinds?: Readonly<Record<string, ResponseKind>>;
}

export type ProblemCode =
  // the file or a row is unusable
  | "unreadable-csv"
  | "missing-column"
  | "duplicate-column"
  | "malformed-row"
  | "missing-label"
  | "invalid-replicate"
  | "non-finite-value"
  | "count-negative"
  | "count-not-whole"
  | "duplicate-replicate"
  | "value-out-of-range"
  // a group or an exclusion cannot be honoured
  | "too-few-labs"
  | "too-few-replicates"
  | "excluded-cell-not-found";

export interface Problem {
  code: ProblemCode;
  message: string;
  row?: number;
  material?: string;
  response?: string;
  lab?: string;
}

export type ConsistencyFlag = "h" | "k";

/** The tests that can raise a finding: E691's h and k, ISO 5725-2's Cochran and Grubbs tests. */
export type FindingTest = "h" | "k" | "cochran" | "grubbs-single" | "grubbs-double";

/**
 * One test's verdict on one lab, with everything a reader needs to check it by
 * hand: the statistic, the critical value(s) and the rule.
 */
export interface Finding {
  test: FindingTest;
  /** h and the Grubbs tests: which side of the other labs the lab's average lies on */
  side: "high" | "low" | null;
  statistic: number;
  /** h, k: the critical value at the chosen significance level (|h| or k above it flags) */
  critical: number | null;
  /** Cochran, Grubbs: critical values at 5 % (straggler) and 1 % (outlier) */
  critical5: number | null;
  critical1: number | null;
  /** ISO 5725-2 class for Cochran and Grubbs; null for h and k */
  class: OutlierClass;
  /** the double Grubbs test: the other lab of the pair */
  partner: string | null;
  /** one line, e.g. "h = 2.34 beyond ±2.06 (ASTM E691, 0.5 %)" */
  text: string;
}

/** One step of ISO 5725-2's screening (§7.3), in the order the practice runs them. */
export interface ScreeningStep {
  test: "cochran" | "grubbs-single" | "grubbs-double";
  side: "high" | "low" | null;
  /** the lab or labs the test looked at */
  labs: string[];
  statistic: number | null;
  critical5: number | null;
  critical1: number | null;
  class: OutlierClass;
  /**
   * "flagged": beyond a critical value; "passed": inside both; "uninformative":
   * ties leave the test nothing to measure (see `reason`); "not-run": the
   * procedure skips it here (see `reason`)
   */
  outcome: "flagged" | "passed" | "uninformative" | "not-run";
  reason: string | null;
}

export interface LabResult {
  lab: string;
  n: number;
  /** cell average */
  mean: number;
  /** cell standard deviation; null with fewer than 2 results */
  sd: number | null;
  /** deviation of the cell average from the average of cell averages */
  d: number | null;
  /** null when not computed or when s_x̄ = 0 */
  h: number | null;
  /** null when not computed or when s_r = 0 */
  k: number | null;
  flags: ConsistencyFlag[];
  /** every test that points at this lab (h, k, Cochran, Grubbs), with its statistic and critical values */
  findings: Finding[];
}

export interface CochranResult {
  C: number | null;
  critical5: number;
  critical1: number;
  class: OutlierClass;
  /** the lab with the largest cell variance; null when C is null */
  lab: string | null;
  /** why the test cannot judge this group (ties), when it cannot; class is then null */
  uninformative: string | null;
}

export interface GrubbsSingleResult {
  G: number | null;
  lab: string;
  critical5: number;
  critical1: number;
  class: OutlierClass;
  /** why the test cannot judge this side (ties), when it cannot; class is then null */
  uninformative: string | null;
}

export interface GrubbsDoubleResult {
  G: number | null;
  labs: [string, string];
  critical5: number;
  critical1: number;
  class: OutlierClass;
  uninformative: string | null;
}

export interface GrubbsResult {
  high: GrubbsSingleResult;
  low: GrubbsSingleResult;
  /**
   * null when not run: below 4 labs, or on a side where the single test
   * already found a straggler or outlier (ISO 5725-2 §7.3.4); see `screening`
   */
  doubleHigh: GrubbsDoubleResult | null;
  doubleLow: GrubbsDoubleResult | null;
}

/** A two-sided 95 % confidence interval of a standard deviation. */
export interface StandardDeviationInterval {
  lower: number;
  upper: number;
  /** degrees of freedom (Satterthwaite's effective value for s_R) */
  df: number;
  method: string;
}

/** How well the study pins down its precision figures. */
export interface PrecisionUncertainty {
  /** 95 % interval of σ_r: chi-square with Σ(n_i − 1) = p(n − 1) degrees of freedom */
  sr: StandardDeviationInterval;
  /** 95 % interval of σ_R: Satterthwaite's approximation */
  sR: StandardDeviationInterval;
  /** ISO 5725-1: σ_r lies within s_r·(1 ± A_r) with about 95 % probability */
  Ar: number;
  /** ISO 5725-1: σ_R within s_R·(1 ± A_R), with γ = s_R/s_r from this group */
  AR: number;
  gamma: number;
}

interface GroupIdentity {
  material: string;
  response: string;
  kind: ResponseKind;
  /** labs (cells) in the group after exclusions */
  p: number;
  /** replicates per cell; with unequal replicates the ISO 5725-2 n̄ (see notes) */
  n: number;
  labs: LabResult[];
  notes: string[];
}

export interface ComputedGroup extends GroupIdentity {
  status: "computed";
  replicatesEqual: boolean;
  /** general mean x̿ (replicate-weighted with unequal replicates) */
  mean: number;
  sx: number;
  sr: number;
  sL: number;
  sR: number;
  r: number;
  R: number;
  /** CV % of s_r and s_R; null when the mean is 0 */
  cvr: number | null;
  cvR: number | null;
  oneSr: number;
  d2sr: number;
  oneSrPercent: number | null;
  d2srPercent: number | null;
  oneSR: number;
  d2sR: number;
  oneSRPercent: number | null;
  d2sRPercent: number | null;
  alpha: SignificanceLevel;
  hCritical: number;
  kCritical: number;
  /** what the significance choice changes, in words */
  significance: string;
  cochran: CochranResult;
  grubbs: GrubbsResult;
  /** ISO 5725-2 §7.3 screening, in order: Cochran, single Grubbs high/low, double Grubbs where run */
  screening: ScreeningStep[];
  uncertainty: PrecisionUncertainty;
}

export interface UncomputedGroup extends GroupIdentity {
  status: "not-computed";
  /** why no precision statistics were computed; the cell statistics in `labs` still are */
  reasons: string[];
}

export type GroupResult = ComputedGroup | UncomputedGroup;

export interface ExcludedCellReport extends ExcludedCell {
  /** how many rows the exclusion removed (0 when the cell had none) */
  results: number;
}

export interface LevelFitReport extends LevelFitResult {
  points: (LevelPoint & { material: string })[];
}

export interface ResponseLevelFit {
  response: string;
  sr: LevelFitReport;
  sR: LevelFitReport;
  /** ASTM C670: one form for both single-operator and multilaboratory figures, and why */
  c670Form: C670Form;
}

export type StudyWarningCode = "few-labs" | "few-materials" | "few-replicates";

/** A shortfall against the practices' minimum design; the figures are still computed. */
export interface StudyWarning {
  code: StudyWarningCode;
  message: string;
  response?: string;
}

export interface StudyAnalysis {
  alpha: SignificanceLevel;
  groups: GroupResult[];
  excluded: ExcludedCellReport[];
  problems: Problem[];
  /** per response, the dependence of s_r and s_R on level across computed materials */
  levelFits: ResponseLevelFit[];
  /** the design falls short of the practices' minimums (labs, materials, replicates) */
  warnings: StudyWarning[];
  /** what the significance choice changes, in words */
  significance: string;
}
