/**
 * Writes download tables (~/lib/exports/table) as CSV or as an .xlsx workbook.
 * Server only: exceljs never reaches the browser bundle.
 *
 * Text that a spreadsheet would run as a formula stays text in both: the CSV
 * gets a leading apostrophe (papaparse's formula escaping), the workbook a
 * string cell, which a spreadsheet never evaluates.
 */
import Papa from "papaparse";
import { type ExportTable, FORMULA_START } from "~/lib/exports/table";

export const CSV_TYPE = "text/csv; charset=utf-8";
export const XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

/** One table as CSV: the column keys as header, numbers as they are, formula-looking text escaped. */
export function csvOfTable(table: ExportTable) {
  return Papa.unparse({ fields: table.columns.map((c) => c.key), data: table.rows }, { escapeFormulae: FORMULA_START, newline: "\r\n" });
}

// Fixed document dates: the same tables give the same file properties whenever they are written.
const DOCUMENT_DATE = new Date(Date.UTC(2000, 0, 1));

/** Tables as sheets of one workbook: a bold, frozen header row of column titles, then the rows. */
export async function workbookOfTables(tables: ExportTable[]): Promise<Uint8Array<ArrayBuffer>> {
  // Loaded when a workbook is first asked for: the library is large, and most requests never need it.
  const { default: ExcelJS } = await import("exceljs");
  const workbook = new ExcelJS.Workbook();
  workbook.creator = "Ringbatch";
  workbook.created = DOCUMENT_DATE;
  workbook.modified = DOCUMENT_DATE;
  for (const table of tables) {
    const sheet = workbook.addWorksheet(table.sheet, { views: [{ state: "frozen", ySplit: 1 }] });
    sheet.columns = table.columns.map((c) => ({ header: c.title, key: c.key, width: Math.max(10, Math.min(40, c.title.length + 4)) }));
    sheet.getRow(1).font = { bold: true };
    // A plain string value is always written as a string cell: exceljs makes a formula only from { formula } objects.
    for (const row of table.rows) sheet.addRow(row.map((cell) => cell ?? null));
  }
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}
