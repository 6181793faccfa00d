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
  /** the replicate numbers met so far: one bit each for 1 … 30, a set for larger ones */
  replicatesSeen: number;
  largeReplicatesSeen: Set<number> | null;
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

/** A row repeating a replicate number of its cell. */
interface RepeatedReplicate {
  position: number;
  cell: CellInProgress;
}

interface CellAssignment {
  groups: GroupInProgress[];
  cells: CellInProgress[];
  /** each row's cell id, −1 for a row that failed a check or repeats a replicate number */
  cellOf: Int32Array;
  repeats: RepeatedReplicate[];
}

/** Notes a replicate number in its cell; true when the cell had met it already. */
function isRepeat(cell: CellInProgress, replicate: number): boolean {
  if (replicate <= 30) {
    const bit = 1 << (replicate - 1);
    const repeated = (cell.replicatesSeen & bit) !== 0;
    cell.replicatesSeen |= bit;
    return repeated;
  }
  cell.largeReplicatesSeen ??= new Set();
  if (cell.largeReplicatesSeen.has(replicate)) return true;
  cell.largeReplicatesSeen.add(replicate);
  return false;
}

/**
 * Checks each row, numbers its cell and keeps the first row of each replicate
 * number in a cell; rows continuing the previous row's group or cell skip the lookups.
 */
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
  const repeats: RepeatedReplicate[] = [];
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
        cell = {
          lab: row.lab,
          start: 0,
          count: 0,
          rowCount: 0,
          problems: NO_PROBLEMS,
          id: cells.length,
          replicatesSeen: 0,
          largeReplicatesSeen: null,
        };
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
    if (isRepeat(cell, replicate)) {
      repeats.push({ position, cell });
      continue;
    }
    cellOf[position] = cell.id;
    cell.count++;
  }

  return { groups, cells, cellOf, repeats };
}

/**
 * Counting sort: each cell's kept results become one contiguous run of the
 * returned buffer, in input order, and the cell's `start` points at it.
 */
function layOutValues(rows: readonly ResultRow[], { cells, cellOf }: CellAssignment): Float64Array {
  const next = new Int32Array(cells.length);
  let total = 0;
  for (const cell of cells) {
    cell.start = next[cell.id] = total;
    total += cell.count;
  }
  const values = new Float64Array(total);
  for (let position = 0; position < cellOf.length; position++) {
    const id = cellOf[position];
    if (id >= 0) values[next[id]++] = rows[position].value;
  }
  return values;
}

/**
 * The problem of each row repeating a replicate number, naming the first row
 * of its cell with that number (found in one pass, for the cells concerned only).
 */
function repeatProblems(rows: readonly ResultRow[], { cellOf, repeats }: CellAssignment, located: LocatedProblem[]): void {
  if (repeats.length === 0) return;
  // cell id → replicate number → position of its first row
  const firstRows = new Map<number, Map<number, number>>();
  for (const { cell } of repeats) firstRows.set(cell.id, new Map());
  for (let position = 0; position < cellOf.length; position++) {
    const firstOfCell = firstRows.get(cellOf[position]);
    if (firstOfCell === undefined) continue;
    const { replicate } = rows[position];
    if (!firstOfCell.has(replicate)) firstOfCell.set(replicate, position);
  }
  for (const { position, cell } of repeats) {
    const row = rows[position];
    const earlier = firstRows.get(cell.id)?.get(row.replicate) as number;
    const message = `replicate ${row.replicate} appears twice in this cell; first at ${rowPlace(rows[earlier], earlier)}`;
    located.push({ position, problem: rowProblem(row, position, "duplicate-replicate", message), owner: cell });
  }
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
 * Built for a million rows: one pass checks the rows, numbers their cells and
 * catches repeated replicate numbers, and a counting sort lays each cell's
 * results out contiguously in one buffer. Cells hold ranges of that buffer
 * rather than arrays of their own, so there is little garbage to collect;
 * each phase is its own function so the engine optimises it whole.
 */
export function groupRows(
  rows: readonly ResultRow[],
  responseKinds: Readonly<Record<string, ResponseKind>>,
): GroupedRows {
  const located: LocatedProblem[] = [];
  const assignment = assignCells(rows, responseKinds, located);
  repeatProblems(rows, assignment, located);
  const values = layOutValues(rows, assignment);
  return { groups: assignment.groups, values, problems: distributeProblems(located) };
}
