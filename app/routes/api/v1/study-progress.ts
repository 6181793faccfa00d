import type { Route } from "./+types/study-progress";
import { apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { studyProgress } from "~/models/study.server";

/**
 * GET /api/v1/studies/:studyId/progress — cell status per lab × material and
 * counts per material. A lab reads its own row only; coordinators and admins
 * read every lab. The overview polls this.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study, access, enrollment } = await requireApiStudyAccess(request, params.studyId, ["coordinator", "admin", "analyst"]);
    const progress = await studyProgress(study, access === "analyst" ? enrollment!.id : undefined);
    return Response.json(progress, { headers: { "Cache-Control": "no-store" } });
  });
}
