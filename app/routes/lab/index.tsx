import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { Card, PageHeader, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { requireRole } from "~/server/guards.server";
import { listLabEnrollments, submittedCellCounts } from "~/models/study.server";
import { ENROLLMENT_STATE, STUDY_STATE } from "~/lib/state-labels";

export const meta: Route.MetaFunction = () => [{ title: "My lab · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  const enrollmentRows = await listLabEnrollments(user.labIds);
  const submitted = await submittedCellCounts(enrollmentRows.map((e) => e.enrollmentId));
  return { enrollments: enrollmentRows.map((e) => ({ ...e, submittedCells: submitted.get(e.enrollmentId) ?? 0 })) };
}

export default function LabHome({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="My lab"
        subtitle="Studies your lab takes part in. You see your own lab's data only."
        actions={
          <Link to="/lab/queries" className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
            Queries to your lab
          </Link>
        }
      />
      <Card>
        {loaderData.enrollments.length === 0 ? (
          <p>Your lab is not enrolled in any study yet.</p>
        ) : (
          <SimpleTable
            caption="Your lab's studies"
            headers={["Study", "Lab", "Your lab code", "Study state", "Results submitted", "Results due"]}
            rows={loaderData.enrollments.map((e) => [
              <span key="s">
                <Link to={`/lab/studies/${e.studyId}`} className="font-semibold text-basalt-700 underline">
                  {e.studyCode}
                </Link>{" "}
                — {e.studyTitle}
              </span>,
              e.labName,
              e.labCode ?? "—",
              <span key="state" className="flex flex-wrap gap-1">
                <StateBadge view={STUDY_STATE[e.studyState]} />
                {e.enrollmentState === "withdrawn" && <StateBadge view={{ ...ENROLLMENT_STATE.withdrawn, label: "Your lab withdrawn" }} />}
              </span>,
              `${e.submittedCells} cells`,
              formatDate(e.resultsDue),
            ])}
          />
        )}
      </Card>
    </>
  );
}
