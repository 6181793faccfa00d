import type { Route } from "./+types/layout";
import { StudyFrame, type StudyTab } from "~/components/study-frame";
import { requireRound, roundAccessMiddleware } from "~/server/round-context.server";

// Coordinators run the round; admins read it.
export const middleware: Route.MiddlewareFunction[] = [roundAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRound(context, ["coordinator", "admin"]);
  return { round: { id: study.id, code: study.code, title: study.title, state: study.state } };
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
  const base = `/rounds/${round.id}`;
  const tabs: StudyTab[] = TABS.map(([path, label]) => ({ to: base + path, label, end: path === "" }));
  return <StudyFrame study={round} tabs={tabs} />;
}
