/**
 * The lab's results file, a CSV text or the first sheet of a workbook, both
 * turned into records and read by the shared reader (~/lib/csv-table): a
 * header row naming at least `material,response,replicate,value`, optionally
 * `tested_on`, `operator` and `version`, in any order. The template the page
 * offers (./results-template) writes exactly these columns.
 */
import { type CsvDelimiter, type CsvTable, readCsvTable, tableFromRecords } from "~/lib/csv-table";
import { decimalCommaAsPoint, hasDecimalComma } from "~/lib/plain-number";
import { type ResultInputRow, shorten } from "./rows";

export const REQUIRED_COLUMNS = ["material", "response", "replicate", "value"] as const;
export const OPTIONAL_COLUMNS = ["tested_on", "operator", "version"] as const;
export const IMPORT_MAX_BYTES = 2 * 1024 * 1024;

const SAVE_AS_UTF8 = "Save it from the spreadsheet as “CSV UTF-8” and choose it again.";

/**
 * The file's text, if it is UTF-8 (or plain ASCII) text; anything else would
 * be read as the wrong characters.
 */
export function decodeCsvText(bytes: Uint8Array): { ok: true; text: string } | { ok: false; message: string } {
  const utf16 = (bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff);
  if (utf16) return { ok: false, message: `The file is UTF-16 text. ${SAVE_AS_UTF8}` };
  if (bytes.includes(0)) return { ok: false, message: "This is not a CSV text file or an .xlsx workbook." };
  try {
    return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    return { ok: false, message: `The file is not UTF-8 text (perhaps Latin-1 or another code page). ${SAVE_AS_UTF8}` };
  }
}

/** An .xlsx workbook is a zip archive, which starts with "PK\x03\x04" (the zip format's local file header). */
export function isZipArchive(bytes: Uint8Array) {
  return bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

/** How the file was read, for the preview to say so. */
export type FileReading = {
  format: "csv" | "xlsx";
  delimiter: CsvDelimiter;
  decimalComma: boolean;
  /** Whether the file carries the template's version column. */
  versions: boolean;
};

export type ParsedImport = {
  rows: ResultInputRow[];
  fileProblems: string[];
  /** Template rows (those with a version) left without a value, which the import skips: nothing stored changes for them. */
  blankRows: number[];
  reading: FileReading;
};

/** The reading in one sentence: "Read as semicolon-separated CSV with decimal commas." */
export function describeReading({ format, delimiter, decimalComma }: Pick<FileReading, "format" | "delimiter" | "decimalComma">) {
  const shape = format === "xlsx" ? "an Excel workbook (first sheet)" : delimiter === ";" ? "semicolon-separated" : "comma-separated";
  return `Read as ${shape}${decimalComma ? " with decimal commas" : ""}.`;
}

/** Parses a CSV text whole. */
export function parseImportCsv(text: string): ParsedImport {
  const { table, quoting, delimiter } = readCsvTable(text);
  const result = tableToRows(table, { format: "csv", delimiter });
  return { ...result, fileProblems: [...quoting.map((q) => `Row ${q.row ?? "?"}: ${q.message}.`), ...result.fileProblems] };
}

/** Reads a workbook's sheet, given as records of cell texts (row 1 first, as the sheet numbers them). */
export function parseImportRecords(records: string[][]): ParsedImport {
  return tableToRows(tableFromRecords(records), { format: "xlsx", delimiter: "," });
}

// A version is what the template wrote: a whole number, 0 for "nothing stored yet".
const VERSION_DIGITS = /^\d{1,9}$/;

function tableToRows(table: CsvTable | null, shape: Pick<FileReading, "format" | "delimiter">): ParsedImport {
  const empty = (fileProblems: string[]): ParsedImport => ({ rows: [], fileProblems, blankRows: [], reading: { ...shape, decimalComma: false, versions: false } });
  if (!table) return empty(["The file is empty."]);
  const { header } = table;
  const missing = REQUIRED_COLUMNS.filter((c) => !header.includes(c));
  if (missing.length > 0) {
    const oneColumn = header.length === 1 && /[;\t]/.test(header[0]!) ? " The header row reads as one column: separate the columns with commas or semicolons." : "";
    return empty([`The header row has no ${missing.map((c) => `“${c}”`).join(", ")} column (needed: ${REQUIRED_COLUMNS.join(",")}; optional: ${OPTIONAL_COLUMNS.join(",")}).${oneColumn}`]);
  }
  const headerProblem = checkHeaderNames(header);
  if (headerProblem) return empty([headerProblem]);
  const fileProblems = table.misshapen.map(({ row, fieldCount }) => `Row ${row} has ${fieldCount} fields where the header has ${header.length}.`);
  const column = (fields: string[], name: string) => (header.includes(name) ? fields[header.indexOf(name)]! : undefined);
  // A file uses decimal commas when any value has one; a decimal point in such a file is then ambiguous (a thousands separator in those locales).
  const decimalComma = table.records.some(({ fields }) => hasDecimalComma(column(fields, "value")!));
  const rows: ResultInputRow[] = [];
  const blankRows: number[] = [];
  for (const { row, fields } of table.records) {
    // Spreadsheets often add unnamed empty columns; a value under one would be lost without a word.
    const unnamed = fields.findIndex((field, i) => header[i] === "" && field !== "");
    if (unnamed >= 0) {
      fileProblems.push(`Row ${row} has a value in column ${unnamed + 1}, which has no name in the header row.`);
      continue;
    }
    const value = column(fields, "value")!;
    const version = column(fields, "version");
    // A template row the lab did not fill in is skipped; a row of the lab's own with no value is refused below, as a slip.
    if (value === "" && version) {
      blankRows.push(row);
      continue;
    }
    if (decimalComma && value.includes(".")) {
      fileProblems.push(`Row ${row}: the value “${shorten(value)}” has a decimal point, where the rest of the file uses decimal commas; write it with a comma.`);
      continue;
    }
    if (version && !VERSION_DIGITS.test(version)) {
      fileProblems.push(`Row ${row}: the version “${shorten(version)}” is not one the template wrote; leave that column as downloaded.`);
      continue;
    }
    rows.push({
      row,
      material: column(fields, "material")!,
      response: column(fields, "response")!,
      replicate: column(fields, "replicate")!,
      value: decimalComma ? decimalCommaAsPoint(value) : value,
      testedOn: column(fields, "tested_on") ?? null,
      operator: column(fields, "operator") ?? null,
      ...(version ? { readVersion: Number(version) } : {}),
    });
  }
  return { rows, fileProblems, blankRows, reading: { ...shape, decimalComma, versions: header.includes("version") } };
}

const KNOWN_COLUMNS: readonly string[] = [...REQUIRED_COLUMNS, ...OPTIONAL_COLUMNS];

/** A column named twice is ambiguous, and one the import does not read would be dropped silently: both are refused. */
function checkHeaderNames(header: string[]) {
  const twice = header.find((name, i) => name !== "" && header.indexOf(name) !== i);
  if (twice) return `The header row names the “${twice}” column twice.`;
  const unknown = [...new Set(header.filter((name) => name !== "" && !KNOWN_COLUMNS.includes(name)))];
  if (unknown.length === 0) return null;
  const shown = unknown.slice(0, 5).map((name) => `“${shorten(name)}”`).join(", ");
  return `The header row has ${unknown.length === 1 ? "a column" : `${unknown.length} columns`} the import does not read: ${shown}${unknown.length > 5 ? ", …" : ""} (it reads ${KNOWN_COLUMNS.join(",")}). Remove or rename ${unknown.length === 1 ? "it" : "them"}.`;
}
