/**
 * The lab's results file, read by the shared reader (~/lib/csv-table): a
 * header row naming at least `material,response,replicate,value`, optionally
 * `tested_on` and `operator`, in any order.
 */
import { type CsvTable, readCsvTable, tableFromRecords } from "~/lib/csv-table";
import { type ResultInputRow, shorten } from "./rows";

export const REQUIRED_COLUMNS = ["material", "response", "replicate", "value"] as const;
export const OPTIONAL_COLUMNS = ["tested_on", "operator"] as const;
export const IMPORT_MAX_BYTES = 2 * 1024 * 1024;

const SAVE_AS_UTF8 = "Save it from the spreadsheet as “CSV UTF-8” and choose it again.";

/**
 * The file's text, if it is UTF-8 (or plain ASCII) text; anything else would
 * be read as the wrong characters. The same check runs in the browser's
 * preview and on submit.
 */
export function decodeCsvText(bytes: Uint8Array): { ok: true; text: string } | { ok: false; message: string } {
  const utf16 = (bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff);
  if (utf16) return { ok: false, message: `The file is UTF-16 text. ${SAVE_AS_UTF8}` };
  if (bytes.includes(0)) return { ok: false, message: "This is not a CSV text file." };
  try {
    return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    return { ok: false, message: `The file is not UTF-8 text (perhaps Latin-1 or another code page). ${SAVE_AS_UTF8}` };
  }
}

export type ParsedImport = { rows: ResultInputRow[]; fileProblems: string[] };

/** Records (as papaparse returns them in the browser's preview) to result rows, or the problems of the file's shape. */
export function recordsToRows(records: string[][]): ParsedImport {
  return tableToRows(tableFromRecords(records));
}

function tableToRows(table: CsvTable | null): ParsedImport {
  if (!table) return { rows: [], fileProblems: ["The file is empty."] };
  const { header } = table;
  const missing = REQUIRED_COLUMNS.filter((c) => !header.includes(c));
  if (missing.length > 0) {
    return { rows: [], fileProblems: [`The header row has no ${missing.map((c) => `“${c}”`).join(", ")} column (needed: ${REQUIRED_COLUMNS.join(",")}; optional: ${OPTIONAL_COLUMNS.join(",")}).`] };
  }
  const headerProblem = checkHeaderNames(header);
  if (headerProblem) return { rows: [], fileProblems: [headerProblem] };
  const fileProblems = table.misshapen.map(({ row, fieldCount }) => `Row ${row} has ${fieldCount} fields where the header has ${header.length}.`);
  const rows: ResultInputRow[] = [];
  for (const { row, fields } of table.records) {
    // Spreadsheets often add unnamed empty columns; a value under one would be lost without a word.
    const unnamed = fields.findIndex((field, i) => header[i] === "" && field !== "");
    if (unnamed >= 0) {
      fileProblems.push(`Row ${row} has a value in column ${unnamed + 1}, which has no name in the header row.`);
      continue;
    }
    const field = (name: string) => (header.includes(name) ? fields[header.indexOf(name)]! : undefined);
    rows.push({ row, material: field("material")!, response: field("response")!, replicate: field("replicate")!, value: field("value")!, testedOn: field("tested_on") ?? null, operator: field("operator") ?? null });
  }
  return { rows, fileProblems };
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

/** Parses the whole text at once (the server's way). */
export function parseImportCsv(text: string): ParsedImport {
  const { table, quoting } = readCsvTable(text);
  const result = tableToRows(table);
  return { rows: result.rows, fileProblems: [...quoting.map((q) => `Row ${q.row ?? "?"}: ${q.message}.`), ...result.fileProblems] };
}
