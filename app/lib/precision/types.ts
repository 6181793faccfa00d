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
}

export interface CochranResult {
  C: number | null;
  critical5: number;
  critical1: number;
  class: OutlierClass;
  /** the lab with the largest cell variance; null when C is null */
  lab: string | null;
}

export interface GrubbsSingleResult {
  G: number | null;
  lab: string;
  critical5: number;
  critical1: number;
  class: OutlierClass;
}

export interface GrubbsDoubleResult {
  G: number | null;
  labs: [string, string];
  critical5: number;
  critical1: number;
  class: OutlierClass;
}

export interface GrubbsResult {
  high: GrubbsSingleResult;
  low: GrubbsSingleResult;
  /** null below 4 or above 40 labs (see notes) */
  doubleHigh: GrubbsDoubleResult | null;
  doubleLow: GrubbsDoubleResult | null;
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
  cochran: CochranResult;
  grubbs: GrubbsResult;
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
}

export interface StudyAnalysis {
  alpha: SignificanceLevel;
  groups: GroupResult[];
  excluded: ExcludedCellReport[];
  problems: Problem[];
  /** per response, the dependence of s_r and s_R on level across computed materials */
  levelFits: ResponseLevelFit[];
}
