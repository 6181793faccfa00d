import type { Route } from "./+types/study-results-csv";
import { apiHandler } from "~/server/api.server";
import { studyExportResponse } from "~/server/study-exports.server";

/** GET /api/v1/studies/:studyId/results.csv — the results in long form, as the JSON sends them, as a download. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(() => studyExportResponse(request, params.studyId, "results", "csv"));
}
