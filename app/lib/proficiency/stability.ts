export interface StabilityCheck {
  /** |ȳ₁ − ȳ₂| */
  difference: number;
  /** 0.3·σ_pt */
  criterion: number;
  passes: boolean;
}

/**
 * Stability check, ISO 13528:2022 Annex B.5 (ISO 13528:2015 B.5): the general
 * average ȳ₁ of the homogeneity check (before shipping) against the average ȳ₂
 * of the samples tested after the round's testing period. The material is
 * adequately stable when |ȳ₁ − ȳ₂| ≤ 0.3·σ_pt.
 */
export function stabilityCheck(meanBefore: number, meanAfter: number, sigmaPt: number): StabilityCheck {
  const difference = Math.abs(meanBefore - meanAfter);
  const criterion = 0.3 * sigmaPt;
  return { difference, criterion, passes: difference <= criterion };
}
