/**
 * The lab's results template, as CSV (…/import/template.csv) or as an .xlsx
 * workbook (…/import/template.xlsx): the import's columns, pre-filled with
 * the lab's materials, responses, replicates, drafts and their versions.
 */
import type { Route } from "./+types/results-template";
import { templateCsv, templateFileName } from "~/lib/results/results-template";
import { importFrame, resultsTemplate } from "~/models/results.server";
import { templateWorkbook } from "~/server/results-workbook.server";
import { requireStudy } from "~/server/study-context.server";

const XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { enrollment } = requireStudy(context, ["analyst"]);
  const template = await resultsTemplate(enrollment!);
  const name = templateFileName(template.studyCode, template.labCode);
  // A template holds the lab's own drafts: never kept by a shared cache.
  const headers = { "Cache-Control": "private, no-store" };
  if (new URL(request.url).pathname.endsWith(".xlsx")) {
    const { responses } = await importFrame(enrollment!);
    const body = await templateWorkbook(template.rows, { studyCode: template.studyCode, labCode: template.labCode, responses });
    return new Response(body, { headers: { ...headers, "Content-Type": XLSX_TYPE, "Content-Disposition": `attachment; filename="${name}.xlsx"` } });
  }
  return new Response(templateCsv(template.rows), { headers: { ...headers, "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${name}.csv"` } });
}
