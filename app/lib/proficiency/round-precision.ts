import type { LevelModel } from "../precision/level-fit";
import type { StudyAnalysis } from "../precision/types";
import type { PublishedPrecision } from "./sigma-pt";

/** One response's published precision as a round keeps it: the fitted relations, when both were fitted, and every material's figures. */
export interface ResponsePrecision {
  relations: { repeatability: LevelModel; reproducibility: LevelModel } | null;
  materials: { code: string; mean: number; sr: number; sR: number }[];
}

/** The published precision of the study a round was set up from, per response key. */
export interface RoundPrecision {
  sourceCode: string | null;
  responses: Record<string, ResponsePrecision>;
}

/** Takes what σ_pt needs out of a published study's frozen analysis. */
export function roundPrecisionFromAnalysis(sourceCode: string, analysis: StudyAnalysis): RoundPrecision {
  const responses: Record<string, ResponsePrecision> = {};
  for (const group of analysis.groups) {
    if (group.status !== "computed") continue;
    const entry = (responses[group.response] ??= { relations: null, materials: [] });
    entry.materials.push({ code: group.material, mean: group.mean, sr: group.sr, sR: group.sR });
  }
  for (const fit of analysis.levelFits) {
    const entry = responses[fit.response];
    const repeatability = fit.sr.candidates.find((c) => c.relation === fit.sr.chosen);
    const reproducibility = fit.sR.candidates.find((c) => c.relation === fit.sR.chosen);
    if (entry && repeatability && reproducibility) entry.relations = { repeatability, reproducibility };
  }
  return { sourceCode, responses };
}

/**
 * The precision figures for σ_pt at a round's level: the study's fitted level
 * relations when it has them (ISO 13528 8.5 asks for σ_r and σ_R at the level
 * of the round), otherwise the figures of the study's material whose mean is
 * closest to the level. Null when the study gave no figures for the response.
 */
export function precisionNearLevel(entry: ResponsePrecision | undefined, level: number): { precision: PublishedPrecision; basis: string } | null {
  if (!entry) return null;
  if (entry.relations) {
    return {
      precision: { basis: "level-relation", ...entry.relations },
      basis: `s_r by ${entry.relations.repeatability.formula}, s_R by ${entry.relations.reproducibility.formula}, at level ${formatLevel(level)}`,
    };
  }
  let nearest: ResponsePrecision["materials"][number] | null = null;
  for (const material of entry.materials) {
    if (nearest === null || Math.abs(material.mean - level) < Math.abs(nearest.mean - level)) nearest = material;
  }
  if (!nearest) return null;
  return {
    precision: { basis: "material", sr: nearest.sr, sR: nearest.sR },
    basis: `s_r and s_R of material ${nearest.code} (mean ${formatLevel(nearest.mean)}), the nearest level`,
  };
}

function formatLevel(level: number) {
  return Number(level.toPrecision(4)).toString();
}
