import type { Problem, ProblemCode, ResponseKind, ResultRow } from "./types";

export interface CellAccumulator {
  lab: string;
  /** the cell's valid results, in input order */
  values: number[];
  replicates: number[];
  /** position in the input of each valid result, to name the first of a duplicate pair */
  positions: number[];
  /** every row routed to this cell, valid or not */
  rowCount: number;
  /** highest replicate so far; rows in replicate order need no set */
  maxReplicate: number;
  replicateSet: Set<number> | null;
  problems: Problem[];
}

export interface GroupAccumulator {
  material: string;
  response: string;
  kind: ResponseKind;
  cells: Map<string, CellAccumulator>;
  /** rows of this group that belong to no cell (a missing lab) */
  problems: Problem[];
}

/** "row 7" for a CSV row, "result 7" (1-based position) for rows given without one. */
function rowPlace(row: ResultRow, position: number): string {
  return row.row !== undefined ? `row ${row.row}` : `result ${position + 1}`;
}

function rowProblem(row: ResultRow, position: number, code: ProblemCode, message: string): Problem {
  const cell = `lab ${row.lab}, material ${row.material}, response ${row.response}, replicate ${row.replicate}`;
  return {
    code,
    message: `${rowPlace(row, position)} (${cell}): ${message}`,
    row: row.row,
    material: row.material,
    response: row.response,
    lab: row.lab,
  };
}

function isLabel(value: unknown): value is string {
  return typeof value === "string" && value.length > 0;
}

function newCell(lab: string): CellAccumulator {
  return { lab, values: [], replicates: [], positions: [], rowCount: 0, maxReplicate: -Infinity, replicateSet: null, problems: [] };
}

/** True when the replicate number is already taken in the cell; records it otherwise. */
function takeReplicate(cell: CellAccumulator, replicate: number): boolean {
  if (cell.replicateSet === null) {
    if (replicate > cell.maxReplicate) {
      cell.maxReplicate = replicate;
      return false;
    }
    cell.replicateSet = new Set(cell.replicates);
  }
  if (cell.replicateSet.has(replicate)) return true;
  cell.replicateSet.add(replicate);
  return false;
}

/**
 * Checks every row and sorts the valid results into (material, response)
 * groups and lab cells, in order of first appearance. A row's problem is kept
 * with the cell it belongs to, so excluding that cell drops it too.
 * Consecutive rows of one cell (the usual file order) skip the map lookups.
 */
export function groupRows(
  rows: readonly ResultRow[],
  responseKinds: Readonly<Record<string, ResponseKind>>,
): { groups: GroupAccumulator[]; problems: Problem[] } {
  const byMaterial = new Map<string, Map<string, GroupAccumulator>>();
  const groups: GroupAccumulator[] = [];
  const problems: Problem[] = [];
  let lastRow: ResultRow | null = null;
  let group: GroupAccumulator | null = null;
  let cell: CellAccumulator | null = null;

  const report = (owner: { problems: Problem[] } | null, problem: Problem) => {
    owner?.problems.push(problem);
    problems.push(problem);
  };

  for (let position = 0; position < rows.length; position++) {
    const row = rows[position];
    const sameCell =
      lastRow !== null && row.lab === lastRow.lab && row.material === lastRow.material && row.response === lastRow.response;
    if (!sameCell) {
      if (!isLabel(row.material) || !isLabel(row.response)) {
        report(null, rowProblem(row, position, "missing-label", "material and response must be named"));
        lastRow = null;
        continue;
      }
      let responses = byMaterial.get(row.material);
      if (responses === undefined) byMaterial.set(row.material, (responses = new Map()));
      group = responses.get(row.response) ?? null;
      if (group === null) {
        group = { material: row.material, response: row.response, kind: responseKinds[row.response] ?? "continuous", cells: new Map(), problems: [] };
        responses.set(row.response, group);
        groups.push(group);
      }
      if (!isLabel(row.lab)) {
        report(group, rowProblem(row, position, "missing-label", "the lab must be named"));
        lastRow = null;
        continue;
      }
      cell = group.cells.get(row.lab) ?? null;
      if (cell === null) group.cells.set(row.lab, (cell = newCell(row.lab)));
      lastRow = row;
    }
    const currentGroup = group as GroupAccumulator;
    const currentCell = cell as CellAccumulator;
    currentCell.rowCount++;

    const { replicate, value } = row;
    let message: string | null = null;
    let code: ProblemCode = "invalid-replicate";
    if (!Number.isInteger(replicate) || replicate < 1) {
      message = "the replicate number must be a whole number of at least 1";
    } else if (typeof value !== "number" || !Number.isFinite(value)) {
      code = "non-finite-value";
      message = "the value is not a finite number";
    } else if (currentGroup.kind === "count" && value < 0) {
      code = "count-negative";
      message = `the value ${value} is negative, but ${row.response} is a count`;
    } else if (currentGroup.kind === "count" && !Number.isInteger(value)) {
      code = "count-not-whole";
      message = `the value ${value} is not a whole number, but ${row.response} is a count`;
    } else if (takeReplicate(currentCell, replicate)) {
      code = "duplicate-replicate";
      const first = currentCell.positions[currentCell.replicates.indexOf(replicate)];
      message = `replicate ${replicate} appears twice in this cell; first at ${rowPlace(rows[first], first)}`;
    }
    if (message !== null) {
      report(currentCell, rowProblem(row, position, code, message));
      continue;
    }
    currentCell.values.push(value);
    currentCell.replicates.push(replicate);
    currentCell.positions.push(position);
  }
  return { groups, problems };
}
