import type { Route } from "./+types/study-analysis-csv";
import { apiHandler } from "~/server/api.server";
import { studyExportResponse } from "~/server/study-exports.server";

/** GET /api/v1/studies/:studyId/analysis.csv[?alpha=0.01] — each lab's cell statistics beside its material's precision figures. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(() => studyExportResponse(request, params.studyId, "analysis", "csv"));
}
