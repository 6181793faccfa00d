/**
 * σ_pt from the repeatability and reproducibility standard deviations of a
 * precision experiment, ISO 13528:2022 8.5 (ISO 13528:2015 8.5):
 * σ_pt = √(σ_R² − σ_r²·(1 − 1/m)), m the number of replicate measurements each
 * participant averages into its reported result. With m = 1 it is σ_R.
 */
export function sigmaPtFromPrecision(sR: number, sr: number, replicates: number): number {
  if (!(replicates >= 1) || !Number.isInteger(replicates)) throw new RangeError("replicates must be a whole number ≥ 1");
  if (!(sR >= 0) || !(sr >= 0)) throw new RangeError("standard deviations cannot be negative");
  const variance = sR * sR - sr * sr * (1 - 1 / replicates);
  if (variance <= 0) throw new RangeError("σ_r exceeds σ_R: the precision figures are inconsistent");
  return Math.sqrt(variance);
}
