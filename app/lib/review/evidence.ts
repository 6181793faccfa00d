/**
 * The committee's view of one material: for each response, every lab's cell
 * by code — its replicate values, its statistics in the analysis (or why it
 * is not there) and the coordinator's decision with its reason.
 */
import { type Identity, withheldIdentities } from "~/lib/blinding";
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

/** A query the coordinator asked about a cell and the lab's answer, as the committee reads them: lab by code, names withheld. */
export type QueryOnRecord = {
  lab: string;
  material: string;
  response: string;
  statistic: string;
  question: string;
  answer: string | null;
  state: "open" | "answered" | "closed";
  askedAt: string;
  answeredAt: string | null;
};

type StoredQuery = Omit<QueryOnRecord, "askedAt"> & { createdAt: string };

/**
 * The queries as reviewers may read them. A lab's answer may name its own
 * people (the coordinator reads it as written), and text stored before the
 * naming check may name anyone: every name of the study is withheld here.
 */
export function blindedQueries(queries: readonly StoredQuery[], identities: readonly Identity[]): QueryOnRecord[] {
  const blind = (text: string) => withheldIdentities(text, identities);
  return queries.map((q) => ({
    lab: q.lab,
    material: q.material,
    response: q.response,
    statistic: blind(q.statistic),
    question: blind(q.question),
    answer: q.answer === null ? null : blind(q.answer),
    state: q.state,
    askedAt: q.createdAt,
    answeredAt: q.answeredAt,
  }));
}

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
