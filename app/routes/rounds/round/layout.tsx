import type { Route } from "./+types/layout";
import { StudyFrame, frameStudy, tabsUnder } from "~/components/study-frame";
import { requireRound, roundAccessMiddleware } from "~/server/round-context.server";

// Coordinators run the round; admins read it.
export const middleware: Route.MiddlewareFunction[] = [roundAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRound(context, ["coordinator", "admin"]);
  return { round: frameStudy(study) };
}

const TABS: [path: string, label: string][] = [
  ["", "Overview"],
  ["/assigned-values", "Assigned values & σ_pt"],
  ["/material-checks", "Homogeneity & stability"],
  ["/scores", "Scores"],
  ["/report", "Round report"],
];

export default function RoundLayout({ loaderData }: Route.ComponentProps) {
  const { round } = loaderData;
  return <StudyFrame study={round} tabs={tabsUnder(`/rounds/${round.id}`, TABS)} />;
}
