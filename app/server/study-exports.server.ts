/**
 * The study's downloads — results and analysis, as CSV or .xlsx — behind the
 * API's access check, so the pages' links and scripts with a token get the
 * same files, shaped by the caller's role.
 */
import { analysisFlatTable, analysisSheets } from "~/lib/exports/analysis-tables";
import type { ExportTable } from "~/lib/exports/table";
import { resultsTable, visibleAnalysis } from "~/models/study-export.server";
import { significanceQuery } from "~/lib/api/schemas";
import { callerView, conditionalRead, readQuery, requireApiStudyAccess } from "~/server/api.server";
import { CSV_TYPE, csvOfTable, workbookOfTables, XLSX_TYPE } from "~/server/spreadsheet.server";

export type StudyExport = "results" | "analysis";
export type ExportFormat = "csv" | "xlsx";

/** Who may download: the study's coordinators and admins, and its reviewers (blinded). */
export const EXPORT_READERS = ["admin", "coordinator", "reviewer"] as const;

export async function studyExportResponse(request: Request, studyIdParam: string | undefined, what: StudyExport, format: ExportFormat) {
  const caller = await requireApiStudyAccess(request, studyIdParam, [...EXPORT_READERS]);
  const { study, access } = caller;
  let tables: ExportTable[];
  if (what === "results") {
    tables = [await resultsTable(study.id, access)];
  } else {
    const analysis = await visibleAnalysis(study, access, readQuery(request, significanceQuery).alpha);
    // A CSV holds one table: the labs' rows with their group's figures beside them.
    tables = format === "csv" ? [analysisFlatTable(analysis)] : analysisSheets(analysis);
  }
  // A reviewer's file says it is blinded, so it is not mistaken for the coordinator's.
  const fileName = `${study.code}-${what}${access === "reviewer" ? "-blinded" : ""}.${format}`;
  // The tag covers the tables themselves: a workbook's bytes are not the same from one writing to the next.
  return conditionalRead(request, callerView(caller), [what, format, tables], async () => ({
    body: format === "csv" ? csvOfTable(tables[0]!) : await workbookOfTables(tables),
    contentType: format === "csv" ? CSV_TYPE : XLSX_TYPE,
    headers: { "Content-Disposition": `attachment; filename="${fileName}"` },
  }));
}
