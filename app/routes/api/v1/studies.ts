import { and, asc, eq, inArray, or } from "drizzle-orm";
import type { Route } from "./+types/studies";
import { db } from "~/db/client.server";
import { enrollments, studies, studyCoordinators, studyReviewers } from "~/db/schema";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, requireApiCaller } from "~/server/api.server";

/** GET /api/v1/studies — the studies the caller may see (a token: the one study it was made for). */
export async function loader({ request }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiCaller(request);
    const { user, token } = caller;
    const columns = { id: studies.id, code: studies.code, title: studies.title, state: studies.state };
    const visible =
      user.role === "admin"
        ? undefined
        : or(
            eq(studies.ownerId, user.id),
            inArray(studies.id, db.select({ id: studyCoordinators.studyId }).from(studyCoordinators).where(eq(studyCoordinators.userId, user.id))),
            inArray(studies.id, db.select({ id: studyReviewers.studyId }).from(studyReviewers).where(eq(studyReviewers.userId, user.id))),
            user.labIds.length ? inArray(studies.id, db.select({ id: enrollments.studyId }).from(enrollments).where(inArray(enrollments.labId, user.labIds))) : undefined,
          );
    // The list has no version of its own: its tag is a digest of what it lists.
    return conditionalRead(request, callerView(caller), null, async () => {
      const rows = await db
        .select(columns)
        .from(studies)
        .where(and(visible, token ? eq(studies.id, token.studyId ?? -1) : undefined))
        .orderBy(asc(studies.code));
      return { body: JSON.stringify({ studies: rows }), contentType: JSON_TYPE };
    });
  });
}
