/**
 * The one reader of results files, for the lab's import and for the
 * precision command line: comma- or semicolon-separated (a spreadsheet in a
 * locale with decimal commas saves semicolons), RFC 4180 quoting (papaparse),
 * the first non-blank record is the header. Records are numbered as a spreadsheet numbers rows (the file's
 * first record is row 1), so a problem can be found in the file. Blank
 * records are skipped. What each caller requires of the columns, and how it
 * words a problem, is its own.
 */
import Papa from "papaparse";

export type CsvRecord = { row: number; fields: string[] };

export type CsvTable = {
  /** Column names, trimmed and lower-case. */
  header: string[];
  /** Records with as many fields as the header has names, each field trimmed. */
  records: CsvRecord[];
  /** Records with another number of fields, which no column can be trusted in. */
  misshapen: { row: number; fieldCount: number }[];
};

/** The table in parsed records (as papaparse returns them), or null when every record is blank. */
export function tableFromRecords(records: string[][]): CsvTable | null {
  const isBlank = (record: string[]) => record.every((field) => field.trim() === "");
  const headerAt = records.findIndex((record) => !isBlank(record));
  if (headerAt < 0) return null;
  const header = records[headerAt]!.map((name) => name.replace(/^\uFEFF/, "").trim().toLowerCase());
  const table: CsvTable = { header, records: [], misshapen: [] };
  records.forEach((record, index) => {
    if (index <= headerAt || isBlank(record)) return;
    const row = index + 1;
    if (record.length === header.length) table.records.push({ row, fields: record.map((field) => field.trim()) });
    else table.misshapen.push({ row, fieldCount: record.length });
  });
  return table;
}

/** Quoting the parser could not make sense of, by row. */
export type CsvQuotingProblem = { row: number | undefined; message: string };

export type CsvDelimiter = "," | ";";

/**
 * The separator the header row uses: semicolons when it has more of them
 * than commas outside quotes. The header names no number, so a decimal comma
 * cannot mislead the count.
 */
export function headerDelimiter(text: string): CsvDelimiter {
  const header = text.split(/\r?\n/).find((line) => line.trim() !== "") ?? "";
  const unquoted = header.replace(/"[^"]*"/g, "");
  const count = (mark: string) => unquoted.split(mark).length - 1;
  return count(";") > count(",") ? ";" : ",";
}

/** Parses the whole text at once (the server's and the command line's way). */
export function readCsvTable(text: string): { table: CsvTable | null; quoting: CsvQuotingProblem[]; delimiter: CsvDelimiter } {
  const content = text.replace(/^\uFEFF/, "");
  const delimiter = headerDelimiter(content);
  const parsed = Papa.parse<string[]>(content, { delimiter, skipEmptyLines: false });
  const quoting = parsed.errors
    .filter((error) => error.code === "MissingQuotes" || error.code === "InvalidQuotes")
    .map((error) => ({ row: error.row === undefined ? undefined : error.row + 1, message: error.message }));
  return { table: tableFromRecords(parsed.data), quoting, delimiter };
}
