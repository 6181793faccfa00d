import { sql } from "drizzle-orm";
import type { Route } from "./+types/healthz";
import { db } from "~/db/client.server";

/** Process up and database reachable. */
export async function loader(_: Route.LoaderArgs) {
  try {
    await db.run(sql`select 1`);
    return Response.json({ status: "ok", database: "reachable" });
  } catch {
    return Response.json({ status: "error", database: "unreachable" }, { status: 503 });
  }
}
