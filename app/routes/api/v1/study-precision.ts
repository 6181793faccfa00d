import type { Route } from "./+types/study-precision";
import { PRECISION_CONTENT_TYPE, PRECISION_READERS, precisionAlpha, rememberPrecisionReader } from "~/server/api-repeat-reads.server";
import { apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { currentAccessVersion } from "~/server/guards.server";
import { studyAnalysisJson } from "~/models/analysis.server";

/**
 * GET /api/v1/studies/:studyId/precision[?alpha=0.01] — the precision engine's
 * output (the command line's shape) over the submitted results, with the
 * coordinator's exclusions applied. The production server answers a caller's
 * repeat reads from memory while nothing has changed (api-repeat-reads.server).
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const accessVersion = await currentAccessVersion();
    const caller = await requireApiStudyAccess(request, params.studyId, PRECISION_READERS);
    const alpha = precisionAlpha(new URL(request.url).searchParams);
    const json = await studyAnalysisJson(caller.study, { alpha });
    await rememberPrecisionReader(request, caller, accessVersion);
    return new Response(json, { headers: { "Content-Type": PRECISION_CONTENT_TYPE } });
  });
}
