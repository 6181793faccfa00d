import type { Problem, ProblemCode, ResponseKind, ResultRow } from "./types";

export interface CellAccumulator {
  lab: string;
  /** the cell's valid results are `values[start, start + count)` of the grouping's shared buffer, in input order */
  start: number;
  count: number;
  /** every row routed to this cell, valid or not */
  rowCount: number;
  problems: readonly Problem[];
}

export interface GroupAccumulator {
  material: string;
  response: string;
  kind: ResponseKind;
  /** in order of first appearance */
  cells: CellAccumulator[];
  /** rows of this group that belong to no cell (a missing lab) */
  problems: readonly Problem[];
}

export interface GroupedRows {
  groups: GroupAccumulator[];
  /** every valid result, each cell's contiguous */
  values: Float64Array;
  problems: Problem[];
}

interface CellInProgress extends CellAccumulator {
  id: number;
}

interface GroupInProgress extends GroupAccumulator {
  /** the group's cells by the study-wide index of their lab */
  cellByLab: (CellInProgress | undefined)[];
}

/** Shared by every owner without problems until its first one: most cells never need an array. */
const NO_PROBLEMS: readonly Problem[] = Object.freeze([]);

/** A problem with the input position it sorts by and the cell or group that keeps it. */
interface LocatedProblem {
  position: number;
  problem: Problem;
  owner: { problems: readonly Problem[] } | null;
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

/**
 * Largest |value| accepted: its square (1e300) and sums of such squares over
 * many results stay below the largest double (about 1.8e308).
 */
export const MAX_MAGNITUDE = 1e150;

/** Which check a row failed, for a row known to fail one. */
function rowDataProblem(row: ResultRow, isCount: boolean): [ProblemCode, string] {
  const { replicate, value } = row;
  if (!Number.isInteger(replicate) || replicate < 1) {
    return ["invalid-replicate", "the replicate number must be a whole number of at least 1"];
  }
  if (typeof value !== "number" || !Number.isFinite(value)) return ["non-finite-value", "the value is not a finite number"];
  if (Math.abs(value) > MAX_MAGNITUDE) {
    return [
      "value-out-of-range",
      `the value ${value} is too large to compute with: its square would overflow double precision; results must lie within ±${MAX_MAGNITUDE}`,
    ];
  }
  if (isCount && value < 0) return ["count-negative", `the value ${value} is negative, but ${row.response} is a count`];
  return ["count-not-whole", `the value ${value} is not a whole number, but ${row.response} is a count`];
}

interface CellAssignment {
  groups: GroupInProgress[];
  cells: CellInProgress[];
  /** each row's cell id, −1 for a row that failed a check */
  cellOf: Int32Array;
}

/** Checks each row and numbers its cell; rows continuing the previous row's group or cell skip the lookups. */
function assignCells(
  rows: readonly ResultRow[],
  responseKinds: Readonly<Record<string, ResponseKind>>,
  located: LocatedProblem[],
): CellAssignment {
  const byMaterial = new Map<string, Map<string, GroupInProgress>>();
  const labIndex = new Map<string, number>();
  const groups: GroupInProgress[] = [];
  const cells: CellInProgress[] = [];
  const cellOf = new Int32Array(rows.length).fill(-1);
  let group: GroupInProgress | null = null;
  let cell: CellInProgress | null = null;

  for (let position = 0; position < rows.length; position++) {
    const row = rows[position];
    if (group === null || row.material !== group.material || row.response !== group.response) {
      cell = null;
      if (!isLabel(row.material) || !isLabel(row.response)) {
        group = null;
        const problem = rowProblem(row, position, "missing-label", "material and response must be named");
        located.push({ position, problem, owner: null });
        continue;
      }
      let responses = byMaterial.get(row.material);
      if (responses === undefined) byMaterial.set(row.material, (responses = new Map()));
      group = responses.get(row.response) ?? null;
      if (group === null) {
        const kind = responseKinds[row.response] ?? "continuous";
        group = { material: row.material, response: row.response, kind, cells: [], problems: NO_PROBLEMS, cellByLab: [] };
        responses.set(row.response, group);
        groups.push(group);
      }
    }
    if (cell === null || row.lab !== cell.lab) {
      if (!isLabel(row.lab)) {
        cell = null;
        located.push({ position, problem: rowProblem(row, position, "missing-label", "the lab must be named"), owner: group });
        continue;
      }
      let lab = labIndex.get(row.lab);
      if (lab === undefined) labIndex.set(row.lab, (lab = labIndex.size));
      cell = group.cellByLab[lab] ?? null;
      if (cell === null) {
        cell = { lab: row.lab, start: 0, count: 0, rowCount: 0, problems: NO_PROBLEMS, id: cells.length };
        cells.push(cell);
        group.cells.push(cell);
        group.cellByLab[lab] = cell;
      }
    }
    cell.rowCount++;
    const { replicate, value } = row;
    const isCount = group.kind === "count";
    // The common case inline; the messages only when a check fails.
    const valid =
      Number.isInteger(replicate) &&
      replicate >= 1 &&
      typeof value === "number" &&
      Number.isFinite(value) &&
      Math.abs(value) <= MAX_MAGNITUDE &&
      (!isCount || (value >= 0 && Number.isInteger(value)));
    if (!valid) {
      const [code, message] = rowDataProblem(row, isCount);
      located.push({ position, problem: rowProblem(row, position, code, message), owner: cell });
      continue;
    }
    cellOf[position] = cell.id;
    cell.count++;
  }

  return { groups, cells, cellOf };
}

/** Counting sort: the checked rows of each cell become one contiguous run of `order`, starting at `start[id]`. */
function orderByCell(cells: readonly CellInProgress[], cellOf: Int32Array): { start: Int32Array; order: Int32Array } {
  const start = new Int32Array(cells.length + 1);
  for (const cell of cells) start[cell.id + 1] = start[cell.id] + cell.count;
  const order = new Int32Array(start[cells.length]);
  const cursor = start.slice(0, cells.length);
  for (let position = 0; position < cellOf.length; position++) {
    const id = cellOf[position];
    if (id >= 0) order[cursor[id]++] = position;
  }
  return { start, order };
}

/**
 * Per cell, drops rows repeating a replicate number (a bit mask covers numbers
 * up to 30, a set the rest) and gathers the values; sets each cell's range.
 */
function gatherCellValues(
  rows: readonly ResultRow[],
  assignment: CellAssignment,
  located: LocatedProblem[],
): Float64Array {
  const { cells } = assignment;
  const { start, order } = orderByCell(cells, assignment.cellOf);
  const values = new Float64Array(order.length);
  for (const cell of cells) {
    const begin = start[cell.id];
    let kept = begin;
    let seenMask = 0;
    let seenLarge: Set<number> | null = null;
    for (let k = begin; k < start[cell.id + 1]; k++) {
      const position = order[k];
      const row = rows[position];
      const replicate = row.replicate;
      let repeated: boolean;
      if (replicate <= 30) {
        const bit = 1 << (replicate - 1);
        repeated = (seenMask & bit) !== 0;
        seenMask |= bit;
      } else {
        seenLarge ??= new Set();
        repeated = seenLarge.has(replicate);
        seenLarge.add(replicate);
      }
      if (repeated) {
        let first = begin;
        while (rows[order[first]].replicate !== replicate) first++;
        const earlier = order[first];
        const message = `replicate ${replicate} appears twice in this cell; first at ${rowPlace(rows[earlier], earlier)}`;
        located.push({ position, problem: rowProblem(row, position, "duplicate-replicate", message), owner: cell });
        continue;
      }
      order[kept] = position;
      values[kept] = row.value;
      kept++;
    }
    cell.start = begin;
    cell.count = kept - begin;
  }
  return values;
}

/** Puts the problems in input order and hands each to the cell or group it belongs to. */
function distributeProblems(located: LocatedProblem[]): Problem[] {
  located.sort((a, b) => a.position - b.position);
  const problems: Problem[] = [];
  for (const { problem, owner } of located) {
    problems.push(problem);
    if (owner === null) continue;
    if (owner.problems === NO_PROBLEMS) owner.problems = [problem];
    else (owner.problems as Problem[]).push(problem);
  }
  return problems;
}

/**
 * Checks every row and sorts the valid results into (material, response)
 * groups and lab cells, in order of first appearance. A row's problem is kept
 * with the cell it belongs to, so excluding that cell drops it too; problems
 * come back in input order.
 * Built for a million rows: one pass checks the rows and numbers their cells,
 * a counting sort lays each cell's results out contiguously in one buffer,
 * and a pass per cell catches repeated replicate numbers. Cells hold ranges
 * of that buffer rather than arrays of their own, so there is little garbage
 * to collect; each phase is its own function so the engine optimises it whole.
 */
export function groupRows(
  rows: readonly ResultRow[],
  responseKinds: Readonly<Record<string, ResponseKind>>,
): GroupedRows {
  const located: LocatedProblem[] = [];
  const assignment = assignCells(rows, responseKinds, located);
  const values = gatherCellValues(rows, assignment, located);
  return { groups: assignment.groups, values, problems: distributeProblems(located) };
}
