/** What the analysis points at, per lab: consistency flags and outlier-test classes, in words. */
import type { ComputedGroup, GroupResult, LabResult, OutlierClass, StudyAnalysis } from "~/lib/precision";
import type { CellRef } from "./cells";

export type LabClasses = { cochran: OutlierClass; grubbs: OutlierClass; grubbsSide: "high" | "low" | null };

const worse = (a: OutlierClass, b: OutlierClass): OutlierClass => (a === "outlier" || b === "outlier" ? "outlier" : a ?? b);

/** ISO 5725-2 classes that concern this lab: Cochran's when it has the largest variance, Grubbs' when its average is the extreme one. */
export function labClasses(group: GroupResult, lab: string): LabClasses {
  if (group.status !== "computed") return { cochran: null, grubbs: null, grubbsSide: null };
  const cochran = group.cochran.lab === lab ? group.cochran.class : null;
  const sides = (["high", "low"] as const).flatMap((side) => {
    const single = group.grubbs[side];
    const double = side === "high" ? group.grubbs.doubleHigh : group.grubbs.doubleLow;
    const cls = worse(single.lab === lab ? single.class : null, double?.labs.includes(lab) ? double.class : null);
    return cls ? [{ side, cls }] : [];
  });
  const grubbs = sides.reduce<OutlierClass>((acc, s) => worse(acc, s.cls), null);
  return { cochran, grubbs, grubbsSide: sides[0]?.side ?? null };
}

/** The statistic that raised a flag, in the form a query quotes it, e.g. `h = 2.41 (critical ±2.15 at 0.5 %)`. */
export function flagStatistic(group: ComputedGroup, lab: LabResult): string {
  const pct = `${Number((group.alpha * 100).toFixed(1))} %`;
  const parts: string[] = [];
  if (lab.flags.includes("h") && lab.h !== null) parts.push(`h = ${lab.h.toFixed(2)} (critical ±${group.hCritical.toFixed(2)} at ${pct})`);
  if (lab.flags.includes("k") && lab.k !== null) parts.push(`k = ${lab.k.toFixed(2)} (critical ${group.kCritical.toFixed(2)} at ${pct})`);
  const classes = labClasses(group, lab.lab);
  if (classes.cochran) parts.push(`Cochran's C = ${group.cochran.C?.toFixed(3)} (${classes.cochran})`);
  if (classes.grubbs) parts.push(`Grubbs ${classes.grubbsSide} (${classes.grubbs})`);
  return parts.join("; ");
}

export type FlaggedCell = CellRef & { statistic: string; flags: LabResult["flags"] };

/** Every cell with an h or k flag or an outlier-test class, in the analysis' order. */
export function flaggedCells(analysis: StudyAnalysis): FlaggedCell[] {
  return analysis.groups.flatMap((group) =>
    group.status !== "computed"
      ? []
      : group.labs
          .filter((lab) => {
            const c = labClasses(group, lab.lab);
            return lab.flags.length > 0 || c.cochran !== null || c.grubbs !== null;
          })
          .map((lab) => ({ lab: lab.lab, material: group.material, response: group.response, flags: lab.flags, statistic: flagStatistic(group, lab) })),
  );
}

/** The suggested wording of a query about a flagged cell; the coordinator edits it before sending. */
export function suggestedQuestion(cell: CellRef, statistic: string) {
  return (
    `Your results for material ${cell.material}, response ${cell.response} stand apart from the other labs (${statistic}). ` +
    `Could you check them against your worksheets and tell us of anything unusual in batching, testing or recording that day?`
  );
}
