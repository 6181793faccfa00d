import { readCsvTable } from "~/lib/csv-table";
import { parsePlainNumber } from "~/lib/plain-number";
import type { Problem, ResultRow } from "./types";

/** The long-form columns a results file must have; any others are ignored. */
export const RESULT_COLUMNS = ["lab", "material", "response", "replicate", "value"] as const;
type ResultColumn = (typeof RESULT_COLUMNS)[number];

export interface ParsedResults {
  rows: ResultRow[];
  /** problems of the file's structure; the rows' data are checked by the analysis */
  problems: Problem[];
}

/**
 * Long-form results CSV to rows, read by the shared reader (~/lib/csv-table:
 * header row, RFC 4180 quoting, rows numbered as a spreadsheet shows them,
 * blank records skipped). A value or replicate that is not a plain number
 * (~/lib/plain-number) becomes NaN, which the analysis reports against its row.
 */
export function parseResultsCsv(text: string): ParsedResults {
  const { table, quoting } = readCsvTable(text);
  const problems: Problem[] = quoting.map(({ row, message }) => ({ code: "malformed-row", message: `row ${row ?? "?"}: ${message}`, row }));
  if (!table) {
    problems.push({ code: "unreadable-csv", message: "the file has no header row (it is empty)" });
    return { rows: [], problems };
  }
  const { header } = table;
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
  for (const { row, fieldCount } of table.misshapen) {
    problems.push({ code: "malformed-row", message: `row ${row}: ${fieldCount} fields where the header has ${header.length}`, row });
  }
  const number = (text: string) => parsePlainNumber(text) ?? Number.NaN;
  const rows: ResultRow[] = table.records.map(({ row, fields }) => ({
    lab: fields[columnIndex.lab]!,
    material: fields[columnIndex.material]!,
    response: fields[columnIndex.response]!,
    replicate: number(fields[columnIndex.replicate]!),
    value: number(fields[columnIndex.value]!),
    row,
  }));
  if (rows.length === 0 && problems.length === 0) {
    problems.push({ code: "unreadable-csv", message: "the file has a header but no results" });
  }
  return { rows, problems };
}
