import type { Route } from "./+types/openapi";
import { openApiDocument } from "~/lib/api/openapi";
import { appUrl } from "~/server/email.server";

/** GET /api/v1/openapi.json — the API described as OpenAPI 3.1, generated from the routes' own schemas. */
export async function loader({ request }: Route.LoaderArgs) {
  return Response.json(openApiDocument(new URL(appUrl(request, "/")).origin), { headers: { "Cache-Control": "public, max-age=300" } });
}
