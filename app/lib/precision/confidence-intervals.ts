import { chiSquareQuantile } from "./distributions";
import { memoize } from "./memoize";
import type { StandardDeviationInterval } from "./types";

/**
 * Whole degrees of freedom recur from group to group (p(n − 1) for every
 * material of a study), so their quantiles are computed once; fractional ones
 * (Satterthwaite) seldom recur and are not kept.
 */
const chiSquareQuantileOfWholeDf = memoize(chiSquareQuantile);

function chiSquare(probability: number, df: number): number {
  return Number.isInteger(df) ? chiSquareQuantileOfWholeDf(probability, df) : chiSquareQuantile(probability, df);
}

/**
 * Two-sided confidence interval of a standard deviation s with ν degrees of
 * freedom (normal data): σ lies in [s·√(ν/χ²_{1−α/2, ν}), s·√(ν/χ²_{α/2, ν})]
 * (the chi-square interval of any statistics textbook; ISO 5725-2 uses it for s_r).
 * ν may be fractional (Satterthwaite).
 */
export function standardDeviationInterval(s: number, df: number, confidence = 0.95, method = "chi-square"): StandardDeviationInterval {
  if (!(s >= 0)) throw new RangeError(`a standard deviation must be at least 0, got ${s}`);
  if (!(df > 0)) throw new RangeError(`degrees of freedom must be positive, got ${df}`);
  const tail = (1 - confidence) / 2;
  return {
    lower: s * Math.sqrt(df / chiSquare(1 - tail, df)),
    upper: s * Math.sqrt(df / chiSquare(tail, df)),
    df,
    method,
  };
}

/**
 * Satterthwaite's effective degrees of freedom of a sum Σ c_j·MS_j of mean
 * squares: ν = (Σ c_j·MS_j)² / Σ (c_j·MS_j)²/ν_j. `terms` are the products
 * c_j·MS_j with their ν_j.
 */
export function satterthwaiteDegreesOfFreedom(terms: readonly { value: number; df: number }[]): number {
  let total = 0;
  let denominator = 0;
  for (const { value, df } of terms) {
    total += value;
    denominator += (value * value) / df;
  }
  return denominator === 0 ? Number.POSITIVE_INFINITY : (total * total) / denominator;
}

/**
 * 95 % interval of σ_r from s_r with Σ(n_i − 1) degrees of freedom — p(n − 1)
 * with equal replicates (ASTM E691 / ISO 5725-2, chi-square).
 */
export function repeatabilityInterval(sr: number, df: number, confidence = 0.95): StandardDeviationInterval {
  return standardDeviationInterval(sr, df, confidence, `chi-square, ${formatDf(df)} degrees of freedom`);
}

/**
 * 95 % interval of σ_R by Satterthwaite's approximation. s_R² = s_d²/n̄ +
 * (1 − 1/n̄)·s_r², with s_d² the between-cell mean square (p − 1 degrees of
 * freedom; n·s_x̄² with equal replicates) and s_r² the within-cell mean square
 * (ν_r degrees of freedom). When s_L² came out negative, s_R = s_r and the
 * interval is that of s_r.
 */
export function reproducibilityInterval(
  input: { sR: number; sr: number; sd2: number; nBar: number; p: number; dfr: number; sLClamped: boolean },
  confidence = 0.95,
): StandardDeviationInterval {
  const { sR, sr, sd2, nBar, p, dfr, sLClamped } = input;
  if (sLClamped) {
    return standardDeviationInterval(sR, dfr, confidence, `s_L² < 0, so s_R = s_r: chi-square, ${formatDf(dfr)} degrees of freedom`);
  }
  const df = satterthwaiteDegreesOfFreedom([
    { value: sd2 / nBar, df: p - 1 },
    { value: (1 - 1 / nBar) * sr * sr, df: dfr },
  ]);
  return standardDeviationInterval(sR, df, confidence, `Satterthwaite, ${formatDf(df)} effective degrees of freedom`);
}

function formatDf(df: number): string {
  return Number.isInteger(df) ? String(df) : df.toFixed(1);
}
