import type { Route } from "./+types/study-what-if";
import { whatIfQuery } from "~/lib/api/schemas";
import { analysisVersion, apiHandler, callerView, conditionalRead, JSON_TYPE, readQuery, requireApiStudyAccess } from "~/server/api.server";
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
    const { alpha, exclude } = readQuery(request, whatIfQuery);
    const exclusions = exclude.map((c) => ({ ...c, reason: "what-if" }));
    // The excluded cells are in the query string, which the tag covers.
    return conditionalRead(request, callerView(caller), analysisVersion(caller.study), async () => ({
      body: await studyAnalysisJson(caller.study, { alpha, exclusions }),
      contentType: JSON_TYPE,
    }));
  });
}
