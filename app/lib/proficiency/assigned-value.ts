/**
 * Standard uncertainty of an assigned value that is the participants'
 * consensus by Algorithm A, ISO 13528:2022 7.7.3 (ISO 13528:2015 7.7.3):
 * u(x_pt) = 1.25 · s* / √p. The factor 1.25 is the ratio of the standard
 * deviation of the Algorithm A mean to that of the arithmetic mean for large
 * normal samples.
 */
export function consensusUncertainty(robustSd: number, participants: number): number {
  if (!(participants >= 1)) throw new RangeError("the consensus needs at least one participant");
  return (1.25 * robustSd) / Math.sqrt(participants);
}

/**
 * ISO 13528:2022 9.2.1: the uncertainty of the assigned value is negligible
 * when u(x_pt) ≤ 0.3·σ_pt; above that, z′ takes it into account.
 */
export function assignedValueUncertaintyNegligible(uncertainty: number, sigmaPt: number): boolean {
  return uncertainty <= 0.3 * sigmaPt;
}
