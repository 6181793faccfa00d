import type { Route } from "./+types/study-precision";
import { significanceQuery } from "~/lib/api/schemas";
import { analysisVersion, apiHandler, callerView, conditionalRead, JSON_TYPE, readQuery, requireApiStudyAccess } from "~/server/api.server";
import { studyAnalysisJson } from "~/models/analysis.server";

/**
 * GET /api/v1/studies/:studyId/precision[?alpha=0.01] — the precision engine's
 * output (the command line's shape) over the submitted results, with the
 * coordinator's exclusions applied. A poller that sends back the ETag gets
 * 304 until a result or decision changes, without the analysis being touched.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const { alpha } = readQuery(request, significanceQuery);
    return conditionalRead(request, callerView(caller), analysisVersion(caller.study), async () => ({
      body: await studyAnalysisJson(caller.study, { alpha }),
      contentType: JSON_TYPE,
    }));
  });
}
