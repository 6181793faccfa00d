/**
 * What the analysis points at, per lab: E691's h and k flags and the ISO
 * 5725-2 screening (Cochran, then single Grubbs, then double Grubbs where the
 * single test found nothing), each with its statistic, critical values and the
 * test that raised it, in words a reader can check by hand.
 */
import type { ComputedGroup, Finding, GroupResult, LabResult, OutlierClass, StudyAnalysis } from "~/lib/precision";
import type { CellRef } from "./cells";

export type LabClasses = { cochran: OutlierClass; grubbs: OutlierClass; grubbsSide: "high" | "low" | null };

const worse = (a: OutlierClass, b: OutlierClass): OutlierClass => (a === "outlier" || b === "outlier" ? "outlier" : a ?? b);

/**
 * ISO 5725-2 classes that concern this lab, from its findings: Cochran's when
 * the test flagged its variance, Grubbs' when the single test flagged its
 * average or the double test flagged the pair it belongs to. Tests that were
 * uninformative (ties) or not run never give a class.
 */
export function labClasses(group: GroupResult, lab: string): LabClasses {
  if (group.status !== "computed") return { cochran: null, grubbs: null, grubbsSide: null };
  const findings = group.labs.find((l) => l.lab === lab)?.findings ?? [];
  let cochran: OutlierClass = null;
  let grubbs: OutlierClass = null;
  let grubbsSide: "high" | "low" | null = null;
  for (const finding of findings) {
    if (finding.test === "cochran") cochran = worse(cochran, finding.class);
    if (finding.test === "grubbs-single" || finding.test === "grubbs-double") {
      grubbs = worse(grubbs, finding.class);
      grubbsSide ??= finding.side;
    }
  }
  return { cochran, grubbs, grubbsSide };
}

/** Every finding on the lab, one per test, joined: what a query quotes, e.g. `h = 2.34, beyond ±2.06 (ASTM E691 at 0.5 %)`. */
export function flagStatistic(_group: ComputedGroup, lab: LabResult): string {
  return (lab.findings ?? []).map((finding) => finding.text).join("; ");
}

export type FlaggedCell = CellRef & { statistic: string; flags: LabResult["flags"]; tests: Finding["test"][]; findings: Finding[] };

/** Every cell with a finding (h, k, Cochran, Grubbs), in the analysis' order. */
export function flaggedCells(analysis: StudyAnalysis): FlaggedCell[] {
  return analysis.groups.flatMap((group) =>
    group.status !== "computed"
      ? []
      : group.labs
          // analyses frozen before findings existed have none
          .filter((lab) => (lab.findings ?? []).length > 0)
          .map((lab) => ({
            lab: lab.lab,
            material: group.material,
            response: group.response,
            flags: lab.flags,
            tests: lab.findings.map((finding) => finding.test),
            findings: lab.findings,
            statistic: flagStatistic(group, lab),
          })),
  );
}

/** The test's question in plain words: scatter within the lab's replicates, or its average apart from the others, on which side. */
function concern(finding: Finding): string {
  switch (finding.test) {
    case "k":
    case "cochran":
      return "the scatter between your replicate results is larger than in the other labs";
    case "h":
    case "grubbs-single":
      return `your average lies ${finding.side === "low" ? "below" : "above"} the other labs' averages`;
    case "grubbs-double":
      return `your average and lab ${finding.partner}'s lie together ${finding.side === "low" ? "below" : "above"} the other labs' averages`;
  }
}

/**
 * The suggested wording of a query about a flagged cell, worded for the tests
 * that raised it; the coordinator edits it before sending. Without findings
 * (a cell the coordinator picked by hand) it asks neutrally.
 */
export function suggestedQuestion(cell: CellRef, statistic: string, findings: readonly Finding[] = []) {
  const concerns = [...new Set(findings.map(concern))];
  const what =
    concerns.length === 0
      ? `Could you check your results for material ${cell.material}, response ${cell.response}`
      : `For material ${cell.material}, response ${cell.response}, ${concerns.join(", and ")} (${statistic}). Could you check them`;
  const ask = findings.some((f) => f.test === "k" || f.test === "cochran")
    ? "tell us of anything that differed between the replicate specimens (batching, operator, timing, recording)?"
    : "tell us of anything unusual in batching, testing or recording that day?";
  return `${what} against your worksheets and ${ask}`;
}
