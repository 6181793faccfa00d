import type { Route } from "./+types/study-results";
import { tableRecords } from "~/lib/exports/table";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiStudyAccess } from "~/server/api.server";
import { resultsTable } from "~/models/study-export.server";
import { EXPORT_READERS } from "~/server/study-exports.server";

/** GET /api/v1/studies/:studyId/results — coordinators (with lab names) and reviewers (lab codes only); the downloads' rows. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiStudyAccess(request, params.studyId, [...EXPORT_READERS]);
    const { study, access } = caller;
    return conditionalRead(request, callerView(caller), null, async () => ({
      body: JSON.stringify({ study: { id: study.id, code: study.code }, results: tableRecords(await resultsTable(study.id, access)) }),
      contentType: JSON_TYPE,
    }));
  });
}
