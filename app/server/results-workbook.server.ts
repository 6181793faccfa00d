/**
 * The lab's results template as an .xlsx workbook, and the reading of a
 * workbook the lab sends back, with exceljs. Server only: exceljs is far too
 * large for the browser, and a workbook is read where it is checked.
 */
import type ExcelJS from "exceljs";
import { formatDate } from "~/lib/format";
import { TEMPLATE_COLUMNS, type TemplateRow } from "~/lib/results/results-template";

/** Loaded on first use: the library is large, and most requests never need it. */
async function newWorkbook() {
  const { default: excel } = await import("exceljs");
  return new excel.Workbook();
}

export type TemplateNotes = { studyCode: string; labCode: string | null; responses: { key: string; name: string; unit: string | null }[] };

/** The template workbook: a "Results" sheet in the import's columns, and an "About" sheet saying how to fill it in. */
export async function templateWorkbook(rows: TemplateRow[], notes: TemplateNotes): Promise<ArrayBuffer> {
  const workbook = await newWorkbook();
  workbook.creator = "Ringbatch";
  const sheet = workbook.addWorksheet("Results", { views: [{ state: "frozen", ySplit: 1 }] });
  sheet.columns = TEMPLATE_COLUMNS.map((name) => ({ header: name, key: name, width: name === "operator" ? 24 : name === "response" ? 14 : 12 }));
  sheet.getRow(1).font = { bold: true };
  for (const row of rows) {
    // Numbers as numbers, so the spreadsheet keeps them right-aligned and sums them; the test date as text, so no locale turns it into another date form.
    sheet.addRow({ ...row, value: row.value ?? undefined, tested_on: row.testedOn ?? "", operator: row.operator ?? "" });
  }
  sheet.getColumn("tested_on").numFmt = "@";
  const about = workbook.addWorksheet("About");
  about.getColumn(1).width = 110;
  const lines = [
    `Results template of lab ${notes.labCode ?? "—"} in study ${notes.studyCode}.`,
    "Fill in the value column of the Results sheet (one row per replicate); test date as YYYY-MM-DD; operator's name.",
    "Rows left without a value are skipped: nothing stored changes for them.",
    "Leave the material, response, replicate and version columns as they are. The version tells the import which saved value",
    "each row was read at: a value someone else saves after the download is reported as a conflict, never overwritten.",
    "Responses:",
    ...notes.responses.map((r) => `  ${r.key}: ${r.name}${r.unit ? ` (${r.unit})` : ""}`),
  ];
  lines.forEach((line, i) => (about.getCell(i + 1, 1).value = line));
  return (await workbook.xlsx.writeBuffer()) as ArrayBuffer;
}

// Rows a results workbook never needs; more is refused before it is read cell by cell.
const MAX_ROWS = 20_000;

/**
 * The "Results" sheet (or else the first) as records of cell texts, row 1
 * first, as the sheet numbers rows; or why it cannot be read.
 */
export async function readWorkbookRecords(bytes: Uint8Array): Promise<{ ok: true; records: string[][] } | { ok: false; message: string }> {
  const workbook = await newWorkbook();
  try {
    await workbook.xlsx.load(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch {
    return { ok: false, message: "The file could not be read as an .xlsx workbook. Save it again from the spreadsheet as .xlsx or as CSV UTF-8." };
  }
  const sheet = workbook.getWorksheet("Results") ?? workbook.worksheets[0];
  if (!sheet) return { ok: false, message: "The workbook has no sheet." };
  if (sheet.rowCount > MAX_ROWS) return { ok: false, message: `The sheet has ${sheet.rowCount} rows; a results file has far fewer. Remove the extra rows.` };
  const width = sheet.columnCount;
  const records: string[][] = [];
  for (let r = 1; r <= sheet.rowCount; r++) {
    const row = sheet.getRow(r);
    records.push(Array.from({ length: width }, (_, c) => cellText(row.getCell(c + 1).value)));
  }
  return { ok: true, records };
}

/** A cell's value as the text the import reads: a formula by its computed result, a date as YYYY-MM-DD. */
function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return "";
  if (value instanceof Date) return formatDate(value);
  if (typeof value === "object") {
    if ("result" in value) return value.result === undefined ? "" : cellText(value.result as ExcelJS.CellValue);
    if ("richText" in value) return value.richText.map((part) => part.text).join("");
    if ("text" in value) return String(value.text);
    if ("error" in value) return String(value.error);
    return "";
  }
  return String(value);
}
