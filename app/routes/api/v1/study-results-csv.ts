import type { Route } from "./+types/study-results-csv";
import { apiHandler, callerView, conditionalRead, requireApiStudyAccess } from "~/server/api.server";
import { exportedResults, resultsCsv } from "~/models/study-export.server";

/** GET /api/v1/studies/:studyId/results.csv — the same rows as the JSON, as a download. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const { study, access } = caller;
    const blinded = access === "reviewer" ? "-blinded" : "";
    return conditionalRead(request, callerView(caller), null, async () => ({
      body: resultsCsv(await exportedResults(study.id, access)),
      contentType: "text/csv; charset=utf-8",
      headers: { "Content-Disposition": `attachment; filename="${study.code}-results${blinded}.csv"` },
    }));
  });
}
