import type { Route } from "./+types/study-bundle";
import { ApiError, apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { BundleUnavailable, statementBundle } from "~/models/bundle.server";

/** GET /api/v1/studies/:studyId/bundle.zip — everything behind the published statement, to recompute it. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const bundle = await statementBundle(study).catch((error: unknown) => {
      throw error instanceof BundleUnavailable ? new ApiError(404, "no_bundle", error.message) : error;
    });
    return new Response(new Uint8Array(bundle.zip), {
      headers: {
        "Content-Type": "application/zip",
        "Content-Disposition": `attachment; filename="${bundle.fileName}"`,
        "X-Content-SHA256": bundle.sha256,
        "Cache-Control": "private, no-store",
      },
    });
  });
}
