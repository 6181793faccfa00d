import { describe, expect, it } from "vitest";
import { groupRows, type CellAccumulator, type GroupedRows } from "./group-rows";
import type { ResultRow } from "./types";

const row = (lab: string, material: string, replicate: number, value: number): ResultRow => ({
  lab,
  material,
  response: "slump",
  replicate,
  value,
});

function cellValues(grouped: GroupedRows, cell: CellAccumulator | undefined): number[] {
  if (cell === undefined) throw new Error("no such cell");
  return Array.from(grouped.values.subarray(cell.start, cell.start + cell.count));
}

describe("groupRows", () => {
  it("sorts interleaved rows into groups and cells in order of first appearance", () => {
    const rows = [row("B", "M2", 1, 1), row("A", "M1", 1, 2), row("B", "M2", 2, 3), row("A", "M2", 1, 4), row("B", "M2", 3, 5)];
    const grouped = groupRows(rows, {});
    expect(grouped.problems).toEqual([]);
    expect(grouped.groups.map((group) => group.material)).toEqual(["M2", "M1"]);
    const m2 = grouped.groups[0];
    expect(m2.cells.map((cell) => cell.lab)).toEqual(["B", "A"]);
    expect(cellValues(grouped, m2.cells[0])).toEqual([1, 3, 5]);
    expect(m2.cells[0].rowCount).toBe(3);
  });

  it("keeps a row's problem with its cell and counts the row there", () => {
    const grouped = groupRows([row("A", "M1", 1, 1), row("A", "M1", 2, Number.NaN)], {});
    const cell = grouped.groups[0].cells[0];
    expect(cell?.problems).toEqual(grouped.problems);
    expect(cellValues(grouped, cell)).toEqual([1]);
    expect(cell?.rowCount).toBe(2);
  });

  it("keeps the first of two rows with one replicate number, also beyond 30 and out of order", () => {
    const rows = [row("A", "M1", 40, 1), row("A", "M1", 2, 2), row("A", "M1", 40, 3), row("A", "M1", 2, 4)];
    const grouped = groupRows(rows, {});
    expect(cellValues(grouped, grouped.groups[0].cells[0])).toEqual([1, 2]);
    expect(grouped.problems.map((problem) => problem.message)).toEqual([
      expect.stringMatching(/^result 3 .*replicate 40 appears twice in this cell; first at result 1$/),
      expect.stringMatching(/^result 4 .*replicate 2 appears twice in this cell; first at result 2$/),
    ]);
  });

  it("takes the response kind from the options", () => {
    const { groups } = groupRows([row("A", "M1", 1, 1)], { slump: "count" });
    expect(groups[0].kind).toBe("count");
  });
});
