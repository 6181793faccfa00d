import { predictLevelModel, type LevelModel } from "../precision/level-fit";

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

/** The published precision of a method at one level: either fitted relations of s_r and s_R to the level, or figures of one material. */
export type PublishedPrecision =
  | { basis: "level-relation"; repeatability: LevelModel; reproducibility: LevelModel }
  | { basis: "material"; sr: number; sR: number };

/**
 * σ_r and σ_R at a round's level: the relations fitted in the precision study
 * (ISO 5725-2 7.5) evaluated at the level, which ISO 13528 8.5 asks for when
 * the precision depends on the level; or a single material's figures.
 */
export function precisionAtLevel(precision: PublishedPrecision, level: number): { sr: number; sR: number } {
  if (precision.basis === "material") return { sr: precision.sr, sR: precision.sR };
  return {
    sr: predictLevelModel(precision.repeatability, level),
    sR: predictLevelModel(precision.reproducibility, level),
  };
}
