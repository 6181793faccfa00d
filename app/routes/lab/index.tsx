import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { Card, PageHeader, SimpleTable } from "~/components/ui";
import { countOf, formatDate } from "~/lib/format";
import { requireRole } from "~/server/guards.server";
import { Pager } from "~/components/pager";
import { requestedPage } from "~/lib/paging";
import { ENROLLMENT_STATE, STUDY_STATE } from "~/lib/state-labels";
import { labEnrollmentsPage, submittedCellCounts } from "~/models/study.server";

export const meta: Route.MetaFunction = () => [{ title: "My lab · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  const { rows, ...page } = await labEnrollmentsPage(user.labIds, requestedPage(new URL(request.url).searchParams));
  const submitted = await submittedCellCounts(rows.map((e) => e.enrollmentId));
  return { enrollments: rows.map((e) => ({ ...e, submittedCells: submitted.get(e.enrollmentId) ?? 0 })), page };
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
                <Link to={`/lab/studies/${e.studyId}`} className="keep-whole font-semibold text-basalt-700 underline">
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
              countOf(e.submittedCells, "cell"),
              formatDate(e.resultsDue),
            ])}
          />
        )}
        <Pager page={loaderData.page.page} pageCount={loaderData.page.pageCount} label="Your lab's study pages" />
      </Card>
    </>
  );
}
