import { describe, expect, it } from "vitest";
import { readCsvTable, tableFromRecords } from "./csv-table";

describe("the shared results-file reader", () => {
  // RFC 4180, section 2: CRLF line breaks (rule 2), fields with commas and line breaks in double quotes (rule 6),
  // a double quote inside a quoted field doubled (rule 7).
  it("reads RFC 4180 quoting and numbers rows from the file's first record", () => {
    const { table, quoting } = readCsvTable('\uFEFF Material ,Note\r\nF1,"late, ""retested"""\r\n\r\nF2,"two\r\nlines"\r\n');
    expect(quoting).toEqual([]);
    expect(table).toEqual({
      header: ["material", "note"],
      records: [
        { row: 2, fields: ["F1", 'late, "retested"'] },
        { row: 4, fields: ["F2", "two\r\nlines"] },
      ],
      misshapen: [],
    });
  });

  it("takes the first non-blank record as the header and sets aside records of another width", () => {
    expect(tableFromRecords([[""], ["a", "b"], ["1"], ["1", "2"], ["1", "2", "3"]])).toEqual({
      header: ["a", "b"],
      records: [{ row: 4, fields: ["1", "2"] }],
      misshapen: [
        { row: 3, fieldCount: 1 },
        { row: 5, fieldCount: 3 },
      ],
    });
    expect(tableFromRecords([[""], [" ", ""]])).toBeNull();
  });

  it("reports a quote left open, by row", () => {
    const { quoting } = readCsvTable('a,b\n1,"2\n');
    expect(quoting.length).toBeGreaterThan(0);
    expect(quoting[0]!.row).toBe(2);
  });
});
