/**
 * ISO 5725-1 (§6.3), uncertainty of an estimated repeatability standard
 * deviation: σ_r lies within s_r·(1 ± A_r) with about 95 % probability,
 * A_r = 1.96·√(1 / (2p(n − 1))). Formula from `reference/critical-values.md`
 * (recalled, re-derived there).
 */
export function repeatabilityUncertainty(p: number, n: number): number {
  if (!(p >= 1 && n > 1)) throw new RangeError(`A_r needs p ≥ 1 and n ≥ 2, got p = ${p}, n = ${n}`);
  return 1.96 * Math.sqrt(1 / (2 * p * (n - 1)));
}

/**
 * ISO 5725-1 (§6.3), uncertainty of an estimated reproducibility standard
 * deviation with γ = σ_R/σ_r: σ_R lies within s_R·(1 ± A_R) with about 95 %
 * probability, A_R = 1.96·√([p(1 + n(γ² − 1))² + (n − 1)(p − 1)] / (2γ⁴n²p(p − 1))).
 */
export function reproducibilityUncertainty(p: number, n: number, gamma: number): number {
  if (!(p >= 2 && n > 1)) throw new RangeError(`A_R needs p ≥ 2 and n ≥ 2, got p = ${p}, n = ${n}`);
  if (!(gamma >= 1)) throw new RangeError(`γ = σ_R/σ_r is at least 1, got ${gamma}`);
  const g2 = gamma * gamma;
  const numerator = p * (1 + n * (g2 - 1)) ** 2 + (n - 1) * (p - 1);
  return 1.96 * Math.sqrt(numerator / (2 * g2 * g2 * n * n * p * (p - 1)));
}
