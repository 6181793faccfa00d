import { describe, expect, it } from "vitest";
import { cellsAmendedAfterQuery } from "./amended-cells";

const cell = { lab: "L03", material: "F1", response: "holes" };
const other = { lab: "L05", material: "F1", response: "holes" };
const day = (d: number) => new Date(Date.UTC(2026, 10, d));

describe("cellsAmendedAfterQuery", () => {
  const query = { ...cell, id: 1, openedAt: day(10), closedAt: day(20) };

  it("counts an amendment that names its correction query", () => {
    expect(cellsAmendedAfterQuery([{ ...cell, at: day(25), queryId: 1 }], [])).toEqual([cell]);
  });

  it("counts an amendment made while a correction query on the same cell was open", () => {
    expect(cellsAmendedAfterQuery([{ ...cell, at: day(15), queryId: null }], [query])).toEqual([cell]);
    expect(cellsAmendedAfterQuery([{ ...cell, at: day(15), queryId: null }], [{ ...query, closedAt: null }])).toEqual([cell]);
  });

  it("leaves out amendments before the query, after it closed, or on another cell", () => {
    const amendments = [
      { ...cell, at: day(5), queryId: null },
      { ...cell, at: day(21), queryId: null },
      { ...other, at: day(15), queryId: null },
    ];
    expect(cellsAmendedAfterQuery(amendments, [query])).toEqual([]);
  });

  it("names a cell once however many of its replicates were amended", () => {
    expect(cellsAmendedAfterQuery([{ ...cell, at: day(12), queryId: 1 }, { ...cell, at: day(13), queryId: 1 }], [query])).toEqual([cell]);
  });
});
