/**
 * Which cells were amended while a correction query on them was open: the
 * committee should know that a value it reads is a lab's correction made at
 * the coordinator's request, not the value first submitted.
 */
import { type CellRef, sameCell } from "./cells";

export type CellAmendment = CellRef & { at: Date; queryId: number | null };
export type CorrectionQuery = CellRef & {
  id: number;
  openedAt: Date;
  closedAt: Date | null;
};

/** An amendment counts when it names its query, or when a correction query on its cell was open at the time. */
export function amendedUnderQuery(
  amendment: CellAmendment,
  queries: readonly CorrectionQuery[],
) {
  if (amendment.queryId !== null) return true;
  return queries.some(
    (q) =>
      sameCell(q, amendment) &&
      q.openedAt <= amendment.at &&
      (q.closedAt === null || q.closedAt > amendment.at),
  );
}

/** The cells (once each) with at least one amendment made under an open correction query. */
export function cellsAmendedAfterQuery(
  amendments: readonly CellAmendment[],
  queries: readonly CorrectionQuery[],
): CellRef[] {
  const found: CellRef[] = [];
  for (const a of amendments) {
    if (!amendedUnderQuery(a, queries) || found.some((c) => sameCell(c, a)))
      continue;
    found.push({ lab: a.lab, material: a.material, response: a.response });
  }
  return found;
}
