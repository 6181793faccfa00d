/**
 * A table for download: the same columns and rows go out as CSV and as a
 * spreadsheet sheet. Columns carry a machine key (the CSV header, stable for
 * scripts) and a title (the spreadsheet's header row, for people).
 */

export type ExportCell = string | number | null;

export type ExportColumn<Row> = { key: string; title: string; value: (row: Row) => ExportCell };

export type ExportTable = { sheet: string; columns: { key: string; title: string }[]; rows: ExportCell[][] };

export function exportTable<Row>(sheet: string, columns: ExportColumn<Row>[], rows: readonly Row[]): ExportTable {
  return {
    sheet,
    columns: columns.map(({ key, title }) => ({ key, title })),
    rows: rows.map((row) => columns.map((column) => column.value(row))),
  };
}

/** The rows as objects keyed by column key, as the JSON API sends them. */
export function tableRecords(table: ExportTable): Record<string, ExportCell>[] {
  return table.rows.map((row) => Object.fromEntries(table.columns.map((column, i) => [column.key, row[i] ?? null])));
}

/**
 * Text a spreadsheet would read as a formula or a command: one starting with
 * =, +, -, @, a tab or a carriage return (OWASP, "CSV Injection"). Anchored at
 * the start only, so text with a line break after the sign is caught too.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;
