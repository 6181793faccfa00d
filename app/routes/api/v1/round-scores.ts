import type { Route } from "./+types/round-scores";
import { labLetter, roundReport } from "~/models/round.server";
import { apiHandler } from "~/server/api.server";
import { requireApiRoundAccess } from "~/server/round-api.server";

/**
 * GET /api/v1/rounds/:roundId/scores — a lab's own scores (once published)
 * with its history across rounds; for the coordinator and admins, every
 * lab's scores by lab code.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study, access, enrollment } = await requireApiRoundAccess(request, params.roundId, ["admin", "coordinator", "analyst"]);
    if (access === "analyst") {
      const letter = await labLetter(study.id, enrollment!);
      return Response.json({
        published: letter !== null,
        labCode: enrollment!.labCode,
        scores: letter?.groups.flatMap((g) => (g.own ? [{ material: g.material.code, response: g.response.key, ...g.own }] : [])) ?? [],
        history: letter?.history ?? [],
      });
    }
    const report = await roundReport(study);
    return Response.json({
      published: report.published,
      scores: report.groups.flatMap((g) => (g.scores?.labs ?? []).map((lab) => ({ material: g.material.code, response: g.response.key, ...lab }))),
    });
  });
}
