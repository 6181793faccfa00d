import type { GroupResult, StudyWarning } from "./types";

/** ASTM E691 asks for at least 6 labs; ISO 5725-1 recommends at least 8. */
export const RECOMMENDED_LABS = 6;
export const ISO_RECOMMENDED_LABS = 8;
/** ASTM E691: at least 3 materials (levels), better 5 or more. */
export const RECOMMENDED_MATERIALS = 3;
/** Both practices: at least 2 results per lab and material. */
export const RECOMMENDED_REPLICATES = 2;

const place = (group: GroupResult) => `${group.material} / ${group.response}`;

/** The labs of a group with fewer results than both practices need (a loop: groups can hold a thousand labs). */
function labsWithFewReplicates(group: GroupResult): string[] {
  const labs: string[] = [];
  for (const lab of group.labs) if (lab.n < RECOMMENDED_REPLICATES) labs.push(lab.lab);
  return labs;
}

/**
 * Where the study falls short of the practices' minimum design: fewer than 6
 * labs in a group (ASTM E691; ISO 5725-1 recommends 8), fewer than 3 materials
 * for a response, fewer than 2 results in a lab's cell. The figures are still
 * computed where they can be; these say how little they rest on.
 */
export function studyWarnings(groups: readonly GroupResult[]): StudyWarning[] {
  const warnings: StudyWarning[] = [];
  const fewLabs = groups.filter((group) => group.p < RECOMMENDED_LABS);
  if (fewLabs.length > 0) {
    const smallest = Math.min(...fewLabs.map((group) => group.p));
    warnings.push({
      code: "few-labs",
      message:
        `fewer than ${RECOMMENDED_LABS} labs: ${fewLabs.map((group) => `${place(group)} (${group.p})`).join(", ")}. ` +
        `ASTM E691 asks for at least ${RECOMMENDED_LABS} labs and ISO 5725-1 recommends at least ${ISO_RECOMMENDED_LABS}; ` +
        (smallest <= 3
          ? "with 3 labs the h and Grubbs tests can hardly flag anything (their critical values are the largest values the statistics can take) and s_R rests on 2 degrees of freedom"
          : "the reproducibility figures rest on few degrees of freedom (see their confidence intervals)"),
    });
  }
  const materialsByResponse = new Map<string, Set<string>>();
  for (const group of groups) {
    const set = materialsByResponse.get(group.response) ?? new Set<string>();
    set.add(group.material);
    materialsByResponse.set(group.response, set);
  }
  for (const [response, materials] of materialsByResponse) {
    if (materials.size < RECOMMENDED_MATERIALS) {
      warnings.push({
        code: "few-materials",
        response,
        message: `${response}: ${materials.size} material${materials.size === 1 ? "" : "s"}; ASTM E691 asks for at least ${RECOMMENDED_MATERIALS} (better 5 or more) to show how precision depends on level, and no level fit is made`,
      });
    }
  }
  const fewReplicates = groups
    .map((group) => ({ group, labs: labsWithFewReplicates(group) }))
    .filter(({ labs }) => labs.length > 0);
  if (fewReplicates.length > 0) {
    warnings.push({
      code: "few-replicates",
      message:
        `fewer than ${RECOMMENDED_REPLICATES} results in a lab's cell: ${fewReplicates
          .map(({ group, labs }) => `${place(group)} (${labs.join(", ")})`)
          .join(", ")}. ` + "Both practices need at least 2 replicates per lab and material to estimate repeatability",
    });
  }
  return warnings;
}
