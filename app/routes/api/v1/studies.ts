import { and, asc, count, eq } from "drizzle-orm";
import type { Route } from "./+types/studies";
import { db } from "~/db/client.server";
import { studies } from "~/db/schema";
import { pageQuery } from "~/lib/api/schemas";
import { readPage } from "~/lib/paging";
import { readableThroughApi } from "~/models/study.server";
import { apiHandler, callerView, conditionalRead, JSON_TYPE, readQuery, requireApiCaller } from "~/server/api.server";

/** Studies per page of the API's list: `?page=2` asks for the next; the answer says how many pages there are. */
const API_PAGE_SIZE = 100;

/** GET /api/v1/studies — the studies the caller may see (a token: the one study it was made for), by code, a page at a time. */
export async function loader({ request }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const caller = await requireApiCaller(request);
    const { user, token } = caller;
    const columns = { id: studies.id, code: studies.code, title: studies.title, kind: studies.kind, state: studies.state };
    const visible = readableThroughApi(user);
    // The list has no version of its own: its tag is a digest of what it lists.
    return conditionalRead(request, callerView(caller), null, async () => {
      const where = and(visible, token ? eq(studies.id, token.studyId ?? -1) : undefined);
      const { rows, ...page } = await readPage(
        readQuery(request, pageQuery).page ?? 1,
        async () => (await db.select({ total: count() }).from(studies).where(where))[0]!.total,
        (limit, offset) => db.select(columns).from(studies).where(where).orderBy(asc(studies.code)).limit(limit).offset(offset),
        API_PAGE_SIZE,
      );
      return { body: JSON.stringify({ studies: rows, page }), contentType: JSON_TYPE };
    });
  });
}
