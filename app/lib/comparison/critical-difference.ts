/**
 * ISO 5725-6, clause 4 (repeatability critical difference): critical difference at 95 % between two averages of n₁
 * and n₂ results obtained in one lab under repeatability conditions:
 * CD = 2.8·σ_r·√(1/(2n₁) + 1/(2n₂)). With one result each it is r = 2.8·σ_r.
 */
export function withinLabCriticalDifference(sr: number, n1: number, n2: number): number {
  return 2.8 * sr * Math.sqrt(1 / (2 * n1) + 1 / (2 * n2));
}

/**
 * ISO 5725-6, clause 4 (reproducibility critical difference): critical difference at 95 % between two averages from two
 * labs, n₁ and n₂ results each: CD = 2.8·√(σ_R² − σ_r²·(1 − 1/(2n₁) − 1/(2n₂))).
 * With one result each it is R = 2.8·σ_R.
 */
export function betweenLabCriticalDifference(sr: number, sR: number, n1: number, n2: number): number {
  return 2.8 * Math.sqrt(Math.max(0, sR ** 2 - sr ** 2 * (1 - 1 / (2 * n1) - 1 / (2 * n2))));
}
