import { eq } from "drizzle-orm";
import { z } from "zod";
import type { Route } from "./+types/enrollment-results";
import { db } from "~/db/client.server";
import { enrollments } from "~/db/schema";
import { ApiError, apiHandler, JSON_TYPE, notYours, readJsonBody, requireApiCaller } from "~/server/api.server";
import { type DraftConflict, enrollmentResults, importResults, ResultsError } from "~/models/results.server";

// Strict: a field the API does not know (a typo, `__proto__`) is refused rather than dropped.
const resultsBody = z.strictObject({
  results: z
    .array(
      z.strictObject({
        material: z.string().min(1).max(40),
        response: z.string().min(1).max(40),
        replicate: z.number().int(),
        value: z.number(),
        testedOn: z.string().max(20).nullish(),
        operator: z.string().max(200).nullish(),
        readVersion: z
          .number()
          .int()
          .min(0)
          .optional()
          .describe("The replicate's `version` as read from GET (0: nothing stored). Given, the write is refused with 409 if the replicate has changed since."),
      }),
    )
    .min(1, { message: "Send at least one result." })
    .max(5000, { message: "Send at most 5000 results per request." }),
});

/** The lab's enrollment, when the caller (session or a `results:write` token for it) acts for that lab. */
async function callersEnrollment(request: Request, enrollmentIdParam: string | undefined) {
  const { user, token } = await requireApiCaller(request);
  const enrollmentId = Number(enrollmentIdParam);
  const enrollment = Number.isSafeInteger(enrollmentId) ? await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollmentId) }) : undefined;
  if (!enrollment || !user.labIds.includes(enrollment.labId)) throw notYours();
  if (token && (token.scope !== "results:write" || token.enrollmentId !== enrollment.id)) throw notYours();
  return { user, enrollment };
}

const staleDetail = (c: DraftConflict) => ({
  row: c.row,
  material: c.material,
  response: c.response,
  replicate: c.replicate,
  currentValue: c.theirValue,
  currentVersion: c.currentVersion,
  changedBy: c.by,
  yourValue: c.yourValue,
});

/**
 * GET /api/v1/enrollments/:enrollmentId/results — the lab's own stored
 * results, each replicate with its `version` for a later write to name.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { enrollment } = await callersEnrollment(request, params.enrollmentId);
    return new Response(JSON.stringify({ enrollment: { id: enrollment.id, studyId: enrollment.studyId, labCode: enrollment.labCode }, results: await enrollmentResults(enrollment) }), {
      headers: { "Content-Type": JSON_TYPE },
    });
  });
}

/**
 * POST /api/v1/enrollments/:enrollmentId/results — a lab writes draft results.
 * All rows are written or none; sending the same rows again changes nothing;
 * rows for submitted cells, and rows whose `readVersion` is no longer the
 * stored one, are refused with 409 (nothing is overwritten silently).
 */
export async function action({ request, params }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") throw new ApiError(405, "method_not_allowed", "Use POST.");
    const { user, enrollment } = await callersEnrollment(request, params.enrollmentId);
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
    if (!outcome.ok && outcome.conflicts.length > 0) {
      const first = outcome.conflicts[0]!;
      const current = first.theirValue === null ? "now has no value" : `now holds ${first.theirValue}`;
      throw new ApiError(
        409,
        "stale_version",
        `${first.material} · ${first.response} · replicate ${first.replicate} ${current} (version ${first.currentVersion}, by ${first.by}) since you read it${outcome.conflicts.length > 1 ? `, and ${outcome.conflicts.length - 1} more changed` : ""}; nothing was written. Read the results again and resend.`,
        outcome.conflicts.map(staleDetail),
      );
    }
    if (!outcome.ok) {
      const conflict = outcome.problems.some((p) => p.submitted);
      throw new ApiError(conflict ? 409 : 422, conflict ? "cell_submitted" : "invalid_results", conflict ? "Some results are for submitted cells; nothing was written." : "Some results were refused; nothing was written.", outcome.problems);
    }
    return Response.json({ received: outcome.imported, changed: outcome.changed });
  });
}
