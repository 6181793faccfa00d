import type { Route } from "./+types/study";
import { apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { studyDescription } from "~/models/study-export.server";

/** GET /api/v1/studies/:studyId — setup, responses, materials and labs, blinded as the caller's role requires. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study, access, enrollment } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer", "analyst"]);
    return Response.json(await studyDescription(study, access, enrollment));
  });
}
