import type { Route } from "./+types/study-results";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiStudyAccess } from "~/server/api.server";
import { exportedResults } from "~/models/study-export.server";

/** GET /api/v1/studies/:studyId/results — coordinators (with lab names) and reviewers (lab codes only). */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const { study, access } = caller;
    return conditionalRead(request, callerView(caller), null, async () => ({
      body: JSON.stringify({ study: { id: study.id, code: study.code }, results: await exportedResults(study.id, access) }),
      contentType: JSON_TYPE,
    }));
  });
}
