import { Link } from "react-router";
import type { Route } from "./+types/tasks";
import { CellStatusBadge } from "~/components/cell-status-badge";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, Notice, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { SHIPMENT_STATE } from "~/lib/state-labels";
import { studyPageMeta } from "~/lib/study-page-meta";
import { enrollmentWorklist } from "~/models/results.server";
import { enrollmentEnded } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";

export const handle = { pageTitle: "Tasks" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Tasks", matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { enrollment } = requireStudy(context, ["analyst"], { endedEnrollment: true });
  // A lab that declined or was withdrawn sees the notice only.
  if (enrollmentEnded(enrollment)) return { ended: enrollment!.state as "declined" | "withdrawn" } as const;
  const worklist = await enrollmentWorklist(enrollment!);
  const { study } = worklist;
  return {
    ended: null,
    study: { id: study.id, resultsDue: study.resultsDue, testMethod: study.testMethod },
    shipment: worklist.shipment,
    materials: worklist.materials,
  };
}

export default function LabStudy({ loaderData }: Route.ComponentProps) {
  if (loaderData.ended) {
    return (
      <Notice>
        {loaderData.ended === "withdrawn"
          ? "The coordinator has withdrawn your lab from this study. Your results are kept as they are, but they can no longer change and are not part of the analysis."
          : "Your lab declined the invitation to this study, so its pages are closed to you. Ask the coordinator if this was a mistake."}
      </Notice>
    );
  }
  const { study, shipment, materials } = loaderData;
  const base = `/lab/studies/${study.id}`;
  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p>
          {study.testMethod}
          {study.resultsDue && <> · results due {formatDate(study.resultsDue)}</>}
        </p>
        <Link
          to={`${base}/import`}
          className="inline-flex min-h-11 items-center rounded-md border border-basalt-500 bg-white px-4 py-2 font-semibold text-basalt-800 hover:bg-basalt-50"
        >
          Import results from CSV
        </Link>
      </div>
      <Card title="Materials received">
        <p className="mb-2">
          Shipment: {shipment ? <StateBadge view={SHIPMENT_STATE[shipment.status]} /> : "not yet sent"}
          {shipment?.receivedOn && <> on {formatDate(shipment.receivedOn)}</>}
          {shipment?.condition && <> · condition {shipment.condition}</>}
        </p>
        <Link to={`${base}/receipt`} className="font-semibold text-basalt-700 underline">
          Confirm receipt and condition
        </Link>
      </Card>
      <Card title="Batches and results">
        <SimpleTable
          caption="Your lab's tasks per material"
          headers={["Material", "Batch sheet", "Results", "Open queries"]}
          rows={materials.map((m) => [
            <span key="m">
              <span className="font-semibold">{m.code}</span> — {m.description}
            </span>,
            <Link key="b" to={`${base}/batch/${m.id}`} className="font-semibold text-basalt-700 underline">
              {m.moistureEntered ? "Batch sheet (moisture entered)" : "Open batch sheet"}
              <span className="sr-only"> for {m.code}</span>
            </Link>,
            <span key="r" className="flex flex-wrap items-center gap-2">
              <CellStatusBadge status={m.status} />
              <Link to={`${base}/results/${m.id}`} className="font-semibold text-basalt-700 underline">
                {m.status === "not_started" || m.status === "draft" ? "Enter results" : "View or amend"}
                <span className="sr-only"> for {m.code}</span>
              </Link>
            </span>,
            m.openQueries > 0 ? (
              <Link key="q" to="/lab/queries" className="font-semibold text-signal-700 underline">
                {m.openQueries} open
              </Link>
            ) : (
              "None"
            ),
          ])}
        />
      </Card>
    </div>
  );
}
