import type { Route } from "./+types/study-analysis-xlsx";
import { apiHandler } from "~/server/api.server";
import { studyExportResponse } from "~/server/study-exports.server";

/** GET /api/v1/studies/:studyId/analysis.xlsx[?alpha=0.01] — precision figures, the labs' cell statistics and the excluded cells, one sheet each. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(() => studyExportResponse(request, params.studyId, "analysis", "xlsx"));
}
