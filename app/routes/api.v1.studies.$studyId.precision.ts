import type { Route } from "./+types/api.v1.studies.$studyId.precision";
import { ApiError, apiHandler, requireApiStudyAccess } from "~/lib/api.server";
import { isSignificanceLevel } from "~/lib/precision";
import { studyAnalysisJson } from "~/models/analysis.server";

/**
 * GET /api/v1/studies/:studyId/precision[?alpha=0.01] — the precision engine's
 * output (the command line's shape) over the submitted results, with the
 * coordinator's exclusions applied.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const alphaParam = new URL(request.url).searchParams.get("alpha");
    const alpha = alphaParam === null ? undefined : Number(alphaParam);
    if (alpha !== undefined && !isSignificanceLevel(alpha)) {
      throw new ApiError(422, "invalid_alpha", "alpha must be 0.005, 0.01 or 0.05.");
    }
    return new Response(await studyAnalysisJson(study, { alpha }), { headers: { "Content-Type": "application/json" } });
  });
}
