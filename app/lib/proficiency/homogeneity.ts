import { mean, sampleStandardDeviation } from "simple-statistics";

/** One homogeneity sample measured twice. */
export type DuplicatePair = readonly [number, number];

export interface HomogeneityCheck {
  /** number of samples g */
  samples: number;
  /** general average of all results */
  generalMean: number;
  /** standard deviation of the sample averages, s_x */
  sx: number;
  /** within-sample standard deviation, s_w */
  sw: number;
  /** between-sample standard deviation, s_s */
  ss: number;
  /** 0.3·σ_pt */
  criterion: number;
  passes: boolean;
}

/**
 * Homogeneity check, ISO 13528:2022 Annex B.3 (ISO 13528:2015 B.3), g samples
 * each tested twice:
 * x̄_t = (x_t1 + x_t2)/2, w_t = |x_t1 − x_t2|,
 * s_x = standard deviation of the x̄_t, s_w = √(Σw_t² / (2g)),
 * s_s = √max(0, s_x² − s_w²/2).
 * Criterion B.2.2: the material is adequately homogeneous when s_s ≤ 0.3·σ_pt.
 */
export function homogeneityCheck(pairs: readonly DuplicatePair[], sigmaPt: number): HomogeneityCheck {
  if (pairs.length < 2) throw new RangeError("a homogeneity check needs at least 2 samples");
  const averages = pairs.map(([first, second]) => (first + second) / 2);
  const sx = sampleStandardDeviation(averages);
  const sw = Math.sqrt(pairs.reduce((sum, [first, second]) => sum + (first - second) ** 2, 0) / (2 * pairs.length));
  const ss = Math.sqrt(Math.max(0, sx * sx - (sw * sw) / 2));
  const criterion = 0.3 * sigmaPt;
  return { samples: pairs.length, generalMean: mean(averages), sx, sw, ss, criterion, passes: ss <= criterion };
}
