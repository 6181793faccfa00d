import { describe, expect, it } from "vitest";
import { decodeCsvText, parseImportCsv } from "./import-csv";
import { resolveResultRows } from "./rows";

const frame = {
  replicatesPerCell: 3,
  materials: [{ id: 1, code: "F1" }, { id: 2, code: "F2" }],
  responses: [{ id: 7, key: "holes", name: "Holes", unit: "passes", kind: "count" as const, decimals: 0, plausibleMin: 1, plausibleMax: 40 }],
  submittedCells: new Set(["2:7"]),
};

describe("the lab's results file", () => {
  it("reads the columns in any order, with the optional ones, numbering rows as a spreadsheet does", () => {
    const parsed = parseImportCsv("\uFEFFOperator,value,replicate,response,material,tested_on\r\nA. Person,9,1,holes,F1,2026-10-14\r\n\r\n\"B, Person\",10,2,holes,F1,\n");
    expect(parsed.fileProblems).toEqual([]);
    expect(parsed.rows).toEqual([
      { row: 2, material: "F1", response: "holes", replicate: "1", value: "9", testedOn: "2026-10-14", operator: "A. Person" },
      { row: 4, material: "F1", response: "holes", replicate: "2", value: "10", testedOn: "", operator: "B, Person" },
    ]);
  });

  it("names a missing column and a row with the wrong number of fields", () => {
    expect(parseImportCsv("material,response,value\nF1,holes,9").fileProblems[0]).toMatch(/no “replicate” column/);
    expect(parseImportCsv("material,response,replicate,value\nF1,holes,1").fileProblems).toEqual(["Row 2 has 3 fields where the header has 4."]);
    expect(parseImportCsv("").fileProblems).toEqual(["The file is empty."]);
  });

  it("resolves rows against the study and names each problem with its row", () => {
    const { rows } = parseImportCsv("material,response,replicate,value\nf1,HOLES,1,9\nF1,holes,1,10\nF1,holes,4,9\nF2,holes,1,9\nF1,holes,2,\n");
    const { resolved, problems } = resolveResultRows(frame, rows, { valueRequired: true });
    expect(resolved).toEqual([{ row: 2, materialId: 1, materialCode: "F1", responseId: 7, responseKey: "holes", replicate: 1, value: 9, testedOn: null, operator: "" }]);
    expect(problems).toEqual([
      { row: 3, field: "replicate", message: "F1 · holes · replicate 1 is already given in row 2." },
      { row: 4, field: "replicate", message: "Replicate must be a whole number from 1 to 3." },
      { row: 5, field: "value", message: "F2 · holes · replicate 1 is already submitted; change it with an amendment (with a reason) on the result entry page.", submitted: true },
      { row: 6, field: "value", message: "The value is empty." },
    ]);
  });
});

describe("the results file's encoding", () => {
  // Byte values from the Unicode standard's UTF-8 and UTF-16 encoding forms and ISO 8859-1 (common practice: spreadsheets export either).
  it("reads UTF-8, with or without a byte order mark", () => {
    expect(decodeCsvText(Uint8Array.from([0x4d, 0xc3, 0xbc, 0x6c]))).toEqual({ ok: true, text: "Mül" });
    expect(decodeCsvText(Uint8Array.from([0xef, 0xbb, 0xbf, 0x61]))).toEqual({ ok: true, text: "a" });
  });

  it("refuses Latin-1, UTF-16 and binary files with a way out", () => {
    const latin1 = decodeCsvText(Uint8Array.from([0x4d, 0xfc, 0x6c]));
    expect(latin1).toMatchObject({ ok: false, message: expect.stringMatching(/not UTF-8 text.*CSV UTF-8/) });
    expect(decodeCsvText(Uint8Array.from([0xff, 0xfe, 0x61, 0x00]))).toMatchObject({ ok: false, message: expect.stringMatching(/UTF-16/) });
    expect(decodeCsvText(Uint8Array.from([0x61, 0x00, 0x62]))).toMatchObject({ ok: false, message: "This is not a CSV text file." });
  });
});
