import type { StudyAccess } from "~/server/guards.server";
import { notYours, requireApiStudyAccess } from "~/server/api.server";

/** The caller's access to a proficiency round through the API, or 404 (also for a study that is not a round). */
export async function requireApiRoundAccess(request: Request, roundIdParam: string | undefined, allowed: StudyAccess[]) {
  const grant = await requireApiStudyAccess(request, roundIdParam, allowed);
  if (grant.study.kind !== "proficiency") throw notYours();
  return grant;
}
