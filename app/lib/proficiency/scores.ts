/**
 * z score, ISO 13528:2022 9.4 (ISO 13528:2015 9.4): z = (x − x_pt) / σ_pt.
 */
export function zScore(result: number, assignedValue: number, sigmaPt: number): number {
  if (!(sigmaPt > 0)) throw new RangeError("σ_pt must be positive");
  return (result - assignedValue) / sigmaPt;
}

/**
 * z′ score, ISO 13528:2022 9.5: z′ = (x − x_pt) / √(σ_pt² + u²(x_pt)), used
 * when the uncertainty of the assigned value is not negligible.
 */
export function zPrimeScore(result: number, assignedValue: number, sigmaPt: number, assignedUncertainty: number): number {
  if (!(sigmaPt > 0)) throw new RangeError("σ_pt must be positive");
  return (result - assignedValue) / Math.sqrt(sigmaPt ** 2 + assignedUncertainty ** 2);
}

/**
 * ζ (zeta) score, ISO 13528:2022 9.6: ζ = (x − x_pt) / √(u²(x) + u²(x_pt)),
 * u(x) the participant's own standard uncertainty of its result.
 */
export function zetaScore(result: number, resultUncertainty: number, assignedValue: number, assignedUncertainty: number): number {
  const denominator = Math.sqrt(resultUncertainty ** 2 + assignedUncertainty ** 2);
  if (!(denominator > 0)) throw new RangeError("ζ needs a positive combined uncertainty");
  return (result - assignedValue) / denominator;
}
