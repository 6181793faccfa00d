import { predictLevelModel, type ComputedGroup, type LevelFitReport, type StudyAnalysis } from "~/lib/precision";

export interface PrecisionAtLevel {
  level: number;
  sr: number;
  sR: number;
  /** how σ_r and σ_R were found: the statement's fitted level relation, or the material nearest in level */
  basis: "level-relation" | "nearest-material";
  /** the material whose figures were used (nearest-material basis) */
  material: string | null;
  /** the level lies outside the range of the study's materials: the figures are extrapolated */
  outsideStudiedRange: boolean;
  studiedRange: [number, number];
}

function chosenModel(fit: LevelFitReport | undefined) {
  return fit?.chosen ? fit.candidates.find((candidate) => candidate.relation === fit.chosen) : undefined;
}

/**
 * ISO 5725-2, clause 7.5 (dependence of precision on level) as ISO 5725-6
 * uses it: σ_r and σ_R at the level of the results being compared, from the
 * relation fitted across the study's materials when one was chosen, else the
 * figures of the material nearest in level. Null when the response has no
 * computed material.
 */
export function precisionAtLevel(analysis: StudyAnalysis, response: string, level: number): PrecisionAtLevel | null {
  const groups = analysis.groups.filter((g): g is ComputedGroup => g.status === "computed" && g.response === response);
  if (groups.length === 0) return null;
  const means = groups.map((g) => g.mean);
  const studiedRange: [number, number] = [Math.min(...means), Math.max(...means)];
  const outsideStudiedRange = level < studiedRange[0] || level > studiedRange[1];
  const fits = analysis.levelFits.find((f) => f.response === response);
  const srModel = chosenModel(fits?.sr);
  const sRModel = chosenModel(fits?.sR);
  if (srModel && sRModel && level > 0) {
    const sr = predictLevelModel(srModel, level);
    // s_R cannot be below s_r (ISO 5725-2, s_R² = s_L² + s_r²)
    const sR = Math.max(predictLevelModel(sRModel, level), sr);
    if (sr > 0) return { level, sr, sR, basis: "level-relation", material: null, outsideStudiedRange, studiedRange };
  }
  const nearest = groups.reduce((best, g) => (Math.abs(g.mean - level) < Math.abs(best.mean - level) ? g : best));
  return { level, sr: nearest.sr, sR: nearest.sR, basis: "nearest-material", material: nearest.material, outsideStudiedRange, studiedRange };
}
