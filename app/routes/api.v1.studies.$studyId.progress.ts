import { data } from "react-router";
import type { Route } from "./+types/api.v1.studies.$studyId.progress";
import { requireStudyAccess } from "~/lib/guards.server";
import { statusCountsByMaterial, studyMatrix } from "~/models/study.server";

/**
 * Cell status per lab × material and counts per material. A lab reads its own
 * row only; coordinators and admins read every lab. The overview polls this.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { study, access, enrollment } = await requireStudyAccess(request, params.studyId, ["coordinator", "admin", "analyst"]);
  const matrix = await studyMatrix(study.id, access === "analyst" ? { enrollmentId: enrollment!.id } : {});
  return data(
    {
      study: { id: study.id, code: study.code, state: study.state, resultsDue: study.resultsDue },
      materials: matrix.materials.map((m) => ({ id: m.id, code: m.code })),
      labs: matrix.rows.map((r) => ({ enrollmentId: r.id, labCode: r.labCode, labName: r.labName, statuses: r.statuses, submitted: r.submitted })),
      counts: statusCountsByMaterial(matrix),
      generatedAt: new Date().toISOString(),
    },
    { headers: { "Cache-Control": "no-store" } },
  );
}
