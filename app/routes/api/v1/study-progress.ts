import type { Route } from "./+types/study-progress";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiStudyAccess } from "~/server/api.server";
import { studyProgress } from "~/models/study.server";

/**
 * GET /api/v1/studies/:studyId/progress — cell status per lab × material and
 * counts per material. A lab reads its own row only; coordinators and admins
 * read every lab. The overview polls this.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["coordinator", "admin", "analyst"]);
    return conditionalRead(request, callerView(caller), null, async () => ({
      body: JSON.stringify(await studyProgress(caller.study, caller.access === "analyst" ? caller.enrollment!.id : undefined)),
      contentType: JSON_TYPE,
    }));
  });
}
