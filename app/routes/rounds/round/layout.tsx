import type { Route } from "./+types/layout";
import { frameStudy, framedStudyLayout } from "~/components/study-frame";
import { requireRound, roundAccessMiddleware } from "~/server/round-context.server";

// Coordinators run the round; admins read it.
export const middleware: Route.MiddlewareFunction[] = [roundAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRound(context, ["coordinator", "admin"]);
  return { study: frameStudy(study) };
}

export default framedStudyLayout("/rounds", [
  ["", "Overview"],
  ["/assigned-values", "Assigned values & σ_pt"],
  ["/material-checks", "Homogeneity & stability"],
  ["/scores", "Scores"],
  ["/report", "Round report"],
]);
