/**
 * The results template a lab downloads: one row per replicate of each cell
 * still in draft, in the columns the import reads (./import-file). Values are
 * the drafts stored when it was made, or blank; `version` is the version of
 * the stored replicate each row was read at (0: nothing stored), so the
 * import can tell a value someone changed since from one the file changes.
 */
import Papa from "papaparse";

export const TEMPLATE_COLUMNS = ["material", "response", "replicate", "value", "tested_on", "operator", "version"] as const;

export type TemplateRow = {
  material: string;
  response: string;
  replicate: number;
  value: number | null;
  testedOn: string | null;
  operator: string | null;
  version: number;
};

/** The template's records, header first, as cell texts. */
export function templateRecords(rows: TemplateRow[]): string[][] {
  return [
    [...TEMPLATE_COLUMNS],
    ...rows.map((r) => [r.material, r.response, String(r.replicate), r.value === null ? "" : String(r.value), r.testedOn ?? "", r.operator ?? "", String(r.version)]),
  ];
}

/**
 * The template as CSV UTF-8: comma-separated, with a byte order mark so a
 * spreadsheet opens it as UTF-8 (common practice for files meant for Excel).
 */
export function templateCsv(rows: TemplateRow[]) {
  return `\uFEFF${Papa.unparse(templateRecords(rows), { newline: "\r\n" })}\r\n`;
}

/** The file name, without extension: study code and lab code, so two labs' files are not mixed up. */
export function templateFileName(studyCode: string, labCode: string | null) {
  return `${studyCode}-${labCode ?? "lab"}-results`.replace(/[^A-Za-z0-9._-]/g, "_");
}
