import type { Route } from "./+types/study-results-csv";
import { apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { exportedResults, resultsCsv } from "~/models/study-export.server";

/** GET /api/v1/studies/:studyId/results.csv — the same rows as the JSON, as a download. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study, access } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const blinded = access === "reviewer" ? "-blinded" : "";
    return new Response(resultsCsv(await exportedResults(study.id, access)), {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="${study.code}-results${blinded}.csv"`,
      },
    });
  });
}
