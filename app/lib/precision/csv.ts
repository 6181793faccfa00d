import Papa from "papaparse";
import type { Problem, ResultRow } from "./types";

/** The long-form columns a results file must have; any others are ignored. */
export const RESULT_COLUMNS = ["lab", "material", "response", "replicate", "value"] as const;
type ResultColumn = (typeof RESULT_COLUMNS)[number];

export interface ParsedResults {
  rows: ResultRow[];
  /** problems of the file's structure; the rows' data are checked by the analysis */
  problems: Problem[];
}

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** A plain decimal number, or NaN (never 0 for an empty field, never hexadecimal or "Infinity"). */
function parseDecimal(text: string): number {
  const trimmed = text.trim();
  return DECIMAL.test(trimmed) ? Number(trimmed) : Number.NaN;
}

function isBlank(record: readonly string[]): boolean {
  return record.every((field) => field.trim() === "");
}

/**
 * Long-form results CSV (comma-separated, header row, RFC 4180 quoting) to rows.
 * Row numbers count CSV records with the header as row 1, as a spreadsheet
 * shows them. Blank records are skipped. A value or replicate that is not a
 * plain number becomes NaN, which the analysis reports against its row.
 */
export function parseResultsCsv(text: string): ParsedResults {
  const problems: Problem[] = [];
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { delimiter: ",", skipEmptyLines: false });
  for (const error of parsed.errors) {
    if (error.code === "MissingQuotes" || error.code === "InvalidQuotes") {
      const row = error.row === undefined ? undefined : error.row + 1;
      problems.push({ code: "malformed-row", message: `row ${row ?? "?"}: ${error.message}`, row });
    }
  }
  const records = parsed.data;
  const headerIndex = records.findIndex((record) => !isBlank(record));
  if (headerIndex < 0) {
    problems.push({ code: "unreadable-csv", message: "the file has no header row (it is empty)" });
    return { rows: [], problems };
  }
  const header = records[headerIndex].map((name) => name.trim().toLowerCase());
  const columnIndex = {} as Record<ResultColumn, number>;
  for (const column of RESULT_COLUMNS) {
    const index = header.indexOf(column);
    if (index < 0) {
      problems.push({ code: "missing-column", message: `the header has no "${column}" column (needed: ${RESULT_COLUMNS.join(", ")})` });
    } else if (header.indexOf(column, index + 1) >= 0) {
      problems.push({ code: "duplicate-column", message: `the header has more than one "${column}" column` });
    }
    columnIndex[column] = index;
  }
  if (problems.some((problem) => problem.code === "missing-column" || problem.code === "duplicate-column")) {
    return { rows: [], problems };
  }

  const rows: ResultRow[] = [];
  for (let index = headerIndex + 1; index < records.length; index++) {
    const record = records[index];
    const row = index + 1;
    if (isBlank(record)) continue;
    if (record.length !== header.length) {
      problems.push({
        code: "malformed-row",
        message: `row ${row}: ${record.length} fields where the header has ${header.length}`,
        row,
      });
      continue;
    }
    rows.push({
      lab: record[columnIndex.lab].trim(),
      material: record[columnIndex.material].trim(),
      response: record[columnIndex.response].trim(),
      replicate: parseDecimal(record[columnIndex.replicate]),
      value: parseDecimal(record[columnIndex.value]),
      row,
    });
  }
  if (rows.length === 0 && problems.length === 0) {
    problems.push({ code: "unreadable-csv", message: "the file has a header but no results" });
  }
  return { rows, problems };
}
