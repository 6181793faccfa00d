import type { StudyAnalysis } from "~/lib/precision";
import { betweenLabCriticalDifference, withinLabCriticalDifference } from "./critical-difference";
import { precisionAtLevel, type PrecisionAtLevel } from "./precision-at-level";

export type ComparisonSetting = "same-lab" | "two-labs";

export interface MixtureResults {
  label: string;
  values: number[];
}

export interface MixtureComparison {
  setting: ComparisonSetting;
  reference: { label: string; n: number; mean: number };
  trial: { label: string; n: number; mean: number };
  /** trial mean − reference mean */
  difference: number;
  criticalDifference: number;
  /** |difference| > critical difference */
  real: boolean;
  precision: PrecisionAtLevel;
}

const mean = (values: readonly number[]) => values.reduce((a, b) => a + b, 0) / values.length;

/**
 * Sets the difference between a trial mixture and a reference mixture against
 * the critical difference at 95 % of ISO 5725-6, clause 4: within one lab from
 * σ_r, between two labs from σ_R and σ_r, both at the level of the two
 * mixtures (the average of their means). Null when the statement has no
 * figures for the response.
 */
export function compareMixtures(
  analysis: StudyAnalysis,
  response: string,
  setting: ComparisonSetting,
  reference: MixtureResults,
  trial: MixtureResults,
): MixtureComparison | null {
  if (reference.values.length === 0 || trial.values.length === 0) throw new RangeError("each mixture needs at least one result");
  const referenceMean = mean(reference.values);
  const trialMean = mean(trial.values);
  const precision = precisionAtLevel(analysis, response, (referenceMean + trialMean) / 2);
  if (!precision) return null;
  const n1 = reference.values.length;
  const n2 = trial.values.length;
  const criticalDifference =
    setting === "same-lab" ? withinLabCriticalDifference(precision.sr, n1, n2) : betweenLabCriticalDifference(precision.sr, precision.sR, n1, n2);
  const difference = trialMean - referenceMean;
  return {
    setting,
    reference: { label: reference.label, n: n1, mean: referenceMean },
    trial: { label: trial.label, n: n2, mean: trialMean },
    difference,
    criticalDifference,
    real: Math.abs(difference) > criticalDifference,
    precision,
  };
}
