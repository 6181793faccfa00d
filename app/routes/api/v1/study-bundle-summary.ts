import type { Route } from "./+types/study-bundle-summary";
import { ApiError, apiHandler, requireApiStudyAccess } from "~/server/api.server";
import { BundleUnavailable, statementBundle } from "~/models/bundle.server";

/** GET /api/v1/studies/:studyId/bundle — the bundle's SHA-256, its files and their hashes, without the zip. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study } = await requireApiStudyAccess(request, params.studyId, ["admin", "coordinator", "reviewer"]);
    const bundle = await statementBundle(study).catch((error: unknown) => {
      throw error instanceof BundleUnavailable ? new ApiError(404, "no_bundle", error.message) : error;
    });
    return Response.json({
      statementVersion: bundle.statementVersion,
      fileName: bundle.fileName,
      sha256: bundle.sha256,
      bytes: bundle.zip.length,
      files: bundle.files,
      download: `/api/v1/studies/${study.id}/bundle.zip`,
    });
  });
}
