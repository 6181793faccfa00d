import type { Route } from "./+types/round";
import { publishedRound, roundReport } from "~/models/round.server";
import { apiHandler } from "~/server/api.server";
import { requireApiRoundAccess } from "~/server/round-api.server";

/**
 * GET /api/v1/rounds/:roundId — the round and, per material × response, the
 * assigned value, σ_pt and their basis. Coordinators and admins get them live
 * before publication too; a lab only once the round is published. No lab
 * scores here (see …/scores) and never lab names.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const { study, access } = await requireApiRoundAccess(request, params.roundId, ["admin", "coordinator", "analyst"]);
    const groups = access === "analyst" ? ((await publishedRound(study.id))?.groups ?? null) : (await roundReport(study)).groups;
    return Response.json({
      round: { id: study.id, code: study.code, title: study.title, testMethod: study.testMethod, state: study.state, replicates: study.replicatesPerCell },
      figures:
        groups?.map((g) => ({
          material: g.material.code,
          response: g.response.key,
          assignedValue: g.scores?.assignedValue ?? null,
          assignedUncertainty: g.scores?.assignedUncertainty ?? null,
          assignedMethod: g.scores?.assignedMethod ?? null,
          assignedBasis: g.assignedBasis,
          sigmaPt: g.scores?.sigmaPt ?? null,
          sigmaMethod: g.scores?.sigmaMethod ?? null,
          sigmaBasis: g.sigmaBasis,
          labsScored: g.scores?.labs.length ?? 0,
          notScoredBecause: g.refusal,
        })) ?? null,
    });
  });
}
