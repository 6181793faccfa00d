/**
 * The committee's view of one material: for each response, every lab's cell
 * by code — its replicate values, its statistics in the analysis (or why it
 * is not there) and the coordinator's decision with its reason.
 */
import type { ExcludedCellReport, GroupResult, LabResult } from "~/lib/precision";

export type DecisionOnRecord = { lab: string; material: string; response: string; decision: "retained" | "excluded"; reason: string; decidedAt: string };

export type CellRecord = {
  lab: string;
  values: { replicate: number; value: number }[];
  /** the cell's statistics; null when the cell is not part of the analysis */
  stats: LabResult | null;
  standing: "analysed" | "excluded" | "not-analysed";
  decision: DecisionOnRecord | null;
};

/** How the group was judged: its size and the critical values of h and k, or why no precision statistics were computed. */
export type GroupCriteria = { p: number; n: number; hCritical: number | null; kCritical: number | null; notComputed: string[] };

export type ResponseRecord = { response: string; criteria: GroupCriteria | null; cells: CellRecord[] };

function criteriaOf(group: GroupResult): GroupCriteria {
  return group.status === "computed"
    ? { p: group.p, n: group.n, hCritical: group.hCritical, kCritical: group.kCritical, notComputed: [] }
    : { p: group.p, n: group.n, hCritical: null, kCritical: null, notComputed: group.reasons };
}

export function materialRecord(input: {
  material: string;
  responses: readonly { key: string }[];
  groups: readonly GroupResult[];
  excluded: readonly ExcludedCellReport[];
  results: readonly { lab: string; response: string; replicate: number; value: number }[];
  decisions: readonly DecisionOnRecord[];
}): ResponseRecord[] {
  return input.responses.map(({ key }) => {
    const group = input.groups.find((g) => g.material === input.material && g.response === key) ?? null;
    const rows = input.results.filter((r) => r.response === key);
    const labs = [...new Set(rows.map((r) => r.lab))].sort();
    const cells = labs.map((lab): CellRecord => {
      const stats = group?.labs.find((l) => l.lab === lab) ?? null;
      const excluded = input.excluded.some((e) => e.lab === lab && e.material === input.material && e.response === key);
      return {
        lab,
        values: rows.filter((r) => r.lab === lab).map(({ replicate, value }) => ({ replicate, value })),
        stats,
        standing: stats ? "analysed" : excluded ? "excluded" : "not-analysed",
        decision: input.decisions.find((d) => d.lab === lab && d.material === input.material && d.response === key) ?? null,
      };
    });
    return { response: key, criteria: group && criteriaOf(group), cells };
  });
}
