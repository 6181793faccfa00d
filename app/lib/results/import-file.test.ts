import { describe, expect, it } from "vitest";
import { decodeCsvText, describeReading, parseImportCsv, parseImportRecords } from "./import-file";
import { templateCsv } from "./results-template";
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
    const { rows, blankRows } = parseImportCsv("material,response,replicate,value\nf1,HOLES,1,9\nF1,holes,1,10\nF1,holes,4,9\nF2,holes,1,9\nF1,holes,2,\n");
    expect(blankRows).toEqual([]);
    const { resolved, problems } = resolveResultRows(frame, rows, { valueRequired: true });
    expect(resolved).toEqual([{ row: 2, materialId: 1, materialCode: "F1", responseId: 7, responseKey: "holes", replicate: 1, value: 9, testedOn: null, operator: "" }]);
    expect(problems).toEqual([
      { row: 3, field: "replicate", message: "F1 · holes · replicate 1 is already given in row 2." },
      { row: 4, field: "replicate", message: "Replicate must be a whole number from 1 to 3." },
      { row: 5, field: "value", message: "F2 · holes · replicate 1 is already submitted; change it with an amendment (with a reason) on the result entry page.", submitted: true },
      { row: 6, field: "value", message: "The value is empty." },
    ]);
  });

  // Common practice: a spreadsheet in a locale whose decimal mark is the comma saves CSV with semicolons (ISO 80000-1 allows either mark, from memory).
  it("reads a semicolon-separated file with decimal commas, and says so", () => {
    const parsed = parseImportCsv("material;response;replicate;value;tested_on\r\nF1;holes;1;9,5;2026-10-14\r\nF1;holes;2;10;2026-10-14\r\n");
    expect(parsed.fileProblems).toEqual([]);
    expect(parsed.rows.map((r) => r.value)).toEqual(["9.5", "10"]);
    expect(parsed.reading).toEqual({ format: "csv", delimiter: ";", decimalComma: true, versions: false });
    expect(describeReading(parsed.reading)).toBe("Read as semicolon-separated with decimal commas.");
    expect(describeReading(parseImportCsv("material,response,replicate,value\nF1,holes,1,9").reading)).toBe("Read as comma-separated.");
  });

  it("refuses a decimal point in a file that uses decimal commas, where it could be a thousands separator", () => {
    const parsed = parseImportCsv("material;response;replicate;value\nF1;holes;1;9,5\nF1;holes;2;1.005\n");
    expect(parsed.fileProblems).toEqual(["Row 3: the value “1.005” has a decimal point, where the rest of the file uses decimal commas; write it with a comma."]);
  });

  it("says when the header row reads as one column", () => {
    expect(parseImportCsv("material\tresponse\treplicate\tvalue\nF1\tholes\t1\t9").fileProblems[0]).toMatch(/reads as one column/);
  });

  it("reads back the template it writes, versions included", () => {
    const csv = templateCsv([
      { material: "F1", response: "holes", replicate: 1, value: 9, testedOn: "2026-10-14", operator: "Rafe Okonkwo-Lind", version: 2 },
      { material: "F1", response: "holes", replicate: 2, value: null, testedOn: null, operator: null, version: 0 },
    ]);
    const parsed = parseImportCsv(csv);
    expect(parsed.fileProblems).toEqual([]);
    expect(parsed.reading.versions).toBe(true);
    expect(parsed.blankRows).toEqual([3]);
    expect(parsed.rows).toEqual([{ row: 2, material: "F1", response: "holes", replicate: "1", value: "9", testedOn: "2026-10-14", operator: "Rafe Okonkwo-Lind", readVersion: 2 }]);
  });

  it("reads a workbook's records like a CSV file, and refuses a version the template could not have written", () => {
    const parsed = parseImportRecords([
      ["material", "response", "replicate", "value", "version"],
      ["F1", "holes", "1", "9.5", "1"],
      ["F1", "holes", "2", "10", "x1"],
    ]);
    expect(describeReading(parsed.reading)).toBe("Read as an Excel workbook (first sheet).");
    expect(parsed.rows).toHaveLength(1);
    expect(parsed.fileProblems).toEqual(["Row 3: the version “x1” is not one the template wrote; leave that column as downloaded."]);
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
    expect(decodeCsvText(Uint8Array.from([0x61, 0x00, 0x62]))).toMatchObject({ ok: false, message: "This is not a CSV text file or an .xlsx workbook." });
  });
});
