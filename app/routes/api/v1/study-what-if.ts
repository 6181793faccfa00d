import type { Route } from "./+types/study-what-if";
import { ApiError, apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { isSignificanceLevel } from "~/lib/precision";
import { parseCellList } from "~/lib/review/cells";
import { studyAnalysis } from "~/models/analysis.server";

/**
 * GET /api/v1/studies/:studyId/what-if?exclude=L01:M3:holes,…[&alpha=0.01] —
 * the precision engine's output with exactly the listed cells left out
 * instead of the saved decisions: the coordinator's preview before a decision
 * is saved. Nothing is written.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator"]);
    const search = new URL(request.url).searchParams;
    const alphaParam = search.get("alpha");
    const alpha = alphaParam === null ? undefined : Number(alphaParam);
    if (alpha !== undefined && !isSignificanceLevel(alpha)) throw new ApiError(422, "invalid_alpha", "alpha must be 0.005, 0.01 or 0.05.");
    const parsed = parseCellList(search.get("exclude"));
    if ("error" in parsed) throw new ApiError(422, "invalid_exclude", parsed.error);
    const exclusions = parsed.cells.map((c) => ({ ...c, reason: "what-if" }));
    return Response.json(await studyAnalysis(study, { alpha, exclusions }));
  });
}
