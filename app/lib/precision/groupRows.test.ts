import { describe, expect, it } from "vitest";
import { groupRows } from "./groupRows";
import type { ResultRow } from "./types";

const row = (lab: string, material: string, replicate: number, value: number): ResultRow => ({
  lab,
  material,
  response: "slump",
  replicate,
  value,
});

describe("groupRows", () => {
  it("sorts interleaved rows into groups and cells in order of first appearance", () => {
    const rows = [row("B", "M2", 1, 1), row("A", "M1", 1, 2), row("B", "M2", 2, 3), row("A", "M2", 1, 4), row("B", "M2", 3, 5)];
    const { groups, problems } = groupRows(rows, {});
    expect(problems).toEqual([]);
    expect(groups.map((group) => group.material)).toEqual(["M2", "M1"]);
    const m2 = groups[0];
    expect([...m2.cells.keys()]).toEqual(["B", "A"]);
    expect(m2.cells.get("B")).toMatchObject({ values: [1, 3, 5], replicates: [1, 2, 3], positions: [0, 2, 4], rowCount: 3 });
  });

  it("keeps a row's problem with its cell and counts the row there", () => {
    const { groups, problems } = groupRows([row("A", "M1", 1, 1), row("A", "M1", 2, Number.NaN)], {});
    const cell = groups[0].cells.get("A");
    expect(cell?.problems).toEqual(problems);
    expect(cell).toMatchObject({ values: [1], rowCount: 2 });
  });

  it("takes the response kind from the options", () => {
    const { groups } = groupRows([row("A", "M1", 1, 1)], { slump: "count" });
    expect(groups[0].kind).toBe("count");
  });
});
