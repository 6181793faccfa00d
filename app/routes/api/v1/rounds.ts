import { and, asc, eq } from "drizzle-orm";
import type { Route } from "./+types/rounds";
import { db } from "~/db/client.server";
import { studies } from "~/db/schema";
import { readableThroughApi } from "~/models/study.server";
import { apiHandler, requireApiCaller } from "~/server/api.server";

/** GET /api/v1/rounds — the proficiency rounds the caller may see: coordinated ones, or those its labs took part in (a token: its one round). */
export async function loader({ request }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { user, token } = await requireApiCaller(request);
    const visible = readableThroughApi(user, { reviewed: false });
    const rows = await db
      .select({ id: studies.id, code: studies.code, title: studies.title, testMethod: studies.testMethod, state: studies.state })
      .from(studies)
      .where(and(eq(studies.kind, "proficiency"), visible, token ? eq(studies.id, token.studyId ?? -1) : undefined))
      .orderBy(asc(studies.code));
    return Response.json({ rounds: rows });
  });
}
