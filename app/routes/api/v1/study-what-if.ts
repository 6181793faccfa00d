import type { Route } from "./+types/study-what-if";
import { analysisVersion, ApiError, apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiStudyAccess, significanceParam } from "~/server/api.server";
import { parseCellList } from "~/lib/review/cells";
import { studyAnalysisJson } from "~/models/analysis.server";

/**
 * GET /api/v1/studies/:studyId/what-if?exclude=L01:M3:holes,…[&alpha=0.01] —
 * the precision engine's output with exactly the listed cells left out
 * instead of the saved decisions: the coordinator's preview before a decision
 * is saved. Nothing is written.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator"]);
    const search = new URL(request.url).searchParams;
    const alpha = significanceParam(search);
    const parsed = parseCellList(search.get("exclude"));
    if ("error" in parsed) throw new ApiError(422, "invalid_exclude", parsed.error);
    const exclusions = parsed.cells.map((c) => ({ ...c, reason: "what-if" }));
    // The excluded cells are in the query string, which the tag covers.
    return conditionalRead(request, callerView(caller), analysisVersion(caller.study), async () => ({
      body: await studyAnalysisJson(caller.study, { alpha, exclusions }),
      contentType: JSON_TYPE,
    }));
  });
}
