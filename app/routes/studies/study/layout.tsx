import { Link, redirect } from "react-router";
import type { Route } from "./+types/layout";
import { StudyFrame, type StudyTab } from "~/components/study-frame";
import { requireStudy, studyAccessMiddleware } from "~/server/study-context.server";

// Coordinators work here; admins read; reviewers read the setup, materials and report.
export const middleware: Route.MiddlewareFunction[] = [studyAccessMiddleware(["coordinator", "admin", "reviewer"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin", "reviewer"]);
  if (study.kind === "ruggedness") throw redirect(`/ruggedness/${study.id}`);
  // A published precision study's method and precision can seed proficiency rounds.
  const canStartRound = access === "coordinator" && study.kind === "precision" && study.state === "published";
  return { study: { id: study.id, code: study.code, title: study.title, state: study.state, kind: study.kind }, access, canStartRound };
}

const COORDINATOR_TABS: [path: string, label: string][] = [
  ["", "Overview"],
  ["/setup", "Setup"],
  ["/labs", "Labs"],
  ["/shipments", "Shipments"],
  ["/results", "Results"],
  ["/analysis", "Analysis"],
  ["/queries", "Queries"],
  ["/statement", "Statement"],
  ["/report", "Report"],
];
const REVIEWER_TABS = COORDINATOR_TABS.filter(([path]) => path === "/setup" || path === "/report");

export default function StudyLayout({ loaderData }: Route.ComponentProps) {
  const { study, access, canStartRound } = loaderData;
  const base = `/studies/${study.id}`;
  const tabs: StudyTab[] = (access === "reviewer" ? REVIEWER_TABS : COORDINATOR_TABS).map(([path, label]) => ({ to: base + path, label, end: path === "" }));
  // A proficiency round uses these pages for enrolment, shipments and results; its scoring has pages of its own.
  // A published precision study offers to start a round from it.
  const roundLink =
    study.kind === "proficiency" ? (
      <>
        {" · "}
        <Link to={`/rounds/${study.id}`} className="font-semibold text-basalt-700 underline">
          proficiency round pages
        </Link>
      </>
    ) : canStartRound ? (
      // An offer for the screen, not part of a printed report.
      <span className="no-print">
        {" · "}
        <Link to={`/rounds/new?from=${study.id}`} className="font-semibold text-basalt-700 underline">
          Start a proficiency round
        </Link>
      </span>
    ) : null;
  return <StudyFrame study={study} tabs={tabs} detail={roundLink} />;
}
