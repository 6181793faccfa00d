import type { Route } from "./+types/study-results-xlsx";
import { apiHandler } from "~/server/api.server";
import { studyExportResponse } from "~/server/study-exports.server";

/** GET /api/v1/studies/:studyId/results.xlsx — the results in long form as a spreadsheet. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(() => studyExportResponse(request, params.studyId, "results", "xlsx"));
}
