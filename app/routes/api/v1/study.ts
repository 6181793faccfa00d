import type { Route } from "./+types/study";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiStudyAccess } from "~/server/api.server";
import { studyDescription } from "~/models/study-export.server";

/** GET /api/v1/studies/:studyId — setup, responses, materials and labs, blinded as the caller's role requires. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer", "analyst"]);
    return conditionalRead(request, callerView(caller), null, async () => ({
      body: JSON.stringify(await studyDescription(caller.study, caller.access, caller.enrollment)),
      contentType: JSON_TYPE,
    }));
  });
}
