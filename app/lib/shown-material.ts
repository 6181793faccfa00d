/**
 * Pages of a large study show one material at a time (`?material=`): the
 * tables a person reads first stay small, and the rest is one link away.
 */
import type { StudyAnalysis } from "~/lib/precision";

/** The material shown by a page: `?material=` when the study has it, otherwise the first. */
export function shownMaterial(requested: string | null, materials: readonly { code: string }[]): string | null {
  return materials.find((m) => m.code === requested)?.code ?? materials[0]?.code ?? null;
}

/**
 * The analysis as a page of one material sends it: every group's precision
 * figures (the summary and level fits span all materials), the labs' cell
 * statistics only for `material`.
 */
export function labsOfOneMaterial(analysis: StudyAnalysis, material: string | null): StudyAnalysis {
  return { ...analysis, groups: analysis.groups.map((g) => (g.material === material ? g : { ...g, labs: [] })) };
}
