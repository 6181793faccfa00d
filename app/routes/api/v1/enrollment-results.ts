import { eq } from "drizzle-orm";
import type { Route } from "./+types/enrollment-results";
import { db } from "~/db/client.server";
import { enrollments } from "~/db/schema";
import { idParam, resultsBody } from "~/lib/api/schemas";
import { ApiError, apiHandler, notYours, readJsonBody, requireApiCaller } from "~/server/api.server";
import { importResults, ResultsError } from "~/models/results.server";

/**
 * POST /api/v1/enrollments/:enrollmentId/results — a lab writes draft results.
 * All rows are written or none; sending the same rows again changes nothing;
 * rows for submitted cells are refused with 409 (they change only by amendment).
 */
export async function action({ request, params }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") throw new ApiError(405, "method_not_allowed", "Use POST.");
    const { user, token } = await requireApiCaller(request);
    const enrollmentId = idParam.safeParse(params.enrollmentId);
    const enrollment = enrollmentId.success ? await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollmentId.data) }) : undefined;
    if (!enrollment || !user.labIds.includes(enrollment.labId)) throw notYours();
    if (token && (token.scope !== "results:write" || token.enrollmentId !== enrollment.id)) throw notYours();
    if (enrollment.state !== "accepted") throw new ApiError(409, "not_enrolled", enrollment.state === "withdrawn" ? "Your lab was withdrawn from this study." : "Your lab has not accepted this study.");
    const parsed = resultsBody.safeParse(await readJsonBody(request));
    if (!parsed.success) {
      throw new ApiError(422, "invalid_results", "The results are not in the expected form.", parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message })));
    }
    let outcome;
    try {
      outcome = await importResults(enrollment, parsed.data.results, user);
    } catch (error) {
      if (error instanceof ResultsError) throw new ApiError(409, "study_not_in_testing", error.message);
      throw error;
    }
    if (!outcome.ok) {
      const conflict = outcome.problems.some((p) => p.submitted);
      throw new ApiError(conflict ? 409 : 422, conflict ? "cell_submitted" : "invalid_results", conflict ? "Some results are for submitted cells; nothing was written." : "Some results were refused; nothing was written.", outcome.problems);
    }
    return Response.json({ received: outcome.imported, changed: outcome.changed });
  });
}
