import { analyzeGroup } from "./analyze-group";
import { groupRows, type GroupAccumulator } from "./group-rows";
import { c670Form } from "./c670-form";
import { levelFit } from "./level-fit";
import { assertSignificanceLevel } from "./significance";
import { significanceDescription } from "./significance-text";
import { studyWarnings } from "./study-warnings";
import type {
  ComputedGroup,
  ExcludedCell,
  ExcludedCellReport,
  GroupResult,
  LevelFitReport,
  Problem,
  ResponseLevelFit,
  ResultRow,
  StudyAnalysis,
  StudyOptions,
} from "./types";

/** Takes the excluded cells out of their groups (with their rows' problems) and reports what each removed. */
function removeExcludedCells(
  groups: readonly GroupAccumulator[],
  excludedCells: readonly ExcludedCell[],
  problems: Problem[],
): { excluded: ExcludedCellReport[]; problems: Problem[] } {
  if (excludedCells.length === 0) return { excluded: [], problems };
  const groupByKey = new Map(groups.map((group) => [`${group.material}\u0000${group.response}`, group]));
  const droppedProblems = new Set<Problem>();
  const notFound: Problem[] = [];
  const excluded = excludedCells.map((exclusion): ExcludedCellReport => {
    const group = groupByKey.get(`${exclusion.material}\u0000${exclusion.response}`);
    const index = group?.cells.findIndex((cell) => cell.lab === exclusion.lab) ?? -1;
    if (group === undefined || index < 0) {
      notFound.push({
        code: "excluded-cell-not-found",
        message: `excluded cell lab ${exclusion.lab}, material ${exclusion.material}, response ${exclusion.response} has no results (left to exclude)`,
        material: exclusion.material,
        response: exclusion.response,
        lab: exclusion.lab,
      });
      return { ...exclusion, results: 0 };
    }
    const [cell] = group.cells.splice(index, 1);
    for (const problem of cell.problems) droppedProblems.add(problem);
    return { ...exclusion, results: cell.rowCount };
  });
  return { excluded, problems: [...problems.filter((problem) => !droppedProblems.has(problem)), ...notFound] };
}

function levelFitReport(groups: readonly ComputedGroup[], statistic: "sr" | "sR"): LevelFitReport {
  const points = groups.map((group) => ({ material: group.material, level: group.mean, s: group[statistic] }));
  return { points, ...levelFit(points) };
}

/** ISO 5725-2, dependence on level: one fit of s_r and one of s_R per response, over its computed materials. */
function levelFits(groups: readonly GroupResult[]): ResponseLevelFit[] {
  const byResponse = new Map<string, ComputedGroup[]>();
  for (const group of groups) {
    if (group.status !== "computed") continue;
    const list = byResponse.get(group.response);
    if (list === undefined) byResponse.set(group.response, [group]);
    else list.push(group);
  }
  return [...byResponse].map(([response, computed]) => ({
    response,
    sr: levelFitReport(computed, "sr"),
    sR: levelFitReport(computed, "sR"),
    c670Form: c670Form(computed.map((group) => ({ level: group.mean, sr: group.sr, sR: group.sR }))),
  }));
}

/**
 * The precision of an interlaboratory study (ASTM E691 with the ISO 5725-2
 * additions and the ASTM C670 forms), one group per (material, response) in
 * order of first appearance. Excluded cells are removed first and listed back.
 * Every problem in the input is reported; a group touched by one, or with too
 * few labs or replicates, comes back with its cell statistics and reasons
 * instead of precision statistics, and the other groups are still computed.
 * `warnings` list where the design falls short of the practices' minimums.
 * Throws RangeError for an unsupported significance level.
 */
export function analyzeStudy(rows: readonly ResultRow[], options: StudyOptions = {}): StudyAnalysis {
  const alpha = assertSignificanceLevel(options.alpha ?? 0.005);
  const grouped = groupRows(rows, options.responseKinds ?? {});
  const { excluded, problems } = removeExcludedCells(grouped.groups, options.excludedCells ?? [], grouped.problems);
  const groups = grouped.groups.map((group) => {
    const analysis = analyzeGroup(group, grouped.values, alpha);
    problems.push(...analysis.problems);
    return analysis.result;
  });
  return {
    alpha,
    groups,
    excluded,
    problems,
    levelFits: levelFits(groups),
    warnings: studyWarnings(groups),
    significance: significanceDescription(alpha),
  };
}
