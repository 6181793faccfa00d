import { Link } from "react-router";
import type { Route } from "./+types/index";
import { Badge, Card, PageHeader, SimpleTable } from "~/components/ui";
import { requireRole } from "~/server/guards.server";
import { labEnrollmentsPage, submittedCellCounts } from "~/models/study.server";
import { requestedPage } from "~/lib/paging";
import { Pager } from "~/components/pager";
import { STATE_LABEL } from "~/lib/state-labels";

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
                <Link to={`/lab/studies/${e.studyId}`} className="font-semibold text-basalt-700 underline">
                  {e.studyCode}
                </Link>{" "}
                — {e.studyTitle}
              </span>,
              e.labName,
              e.labCode ?? "—",
              <span key="state" className="flex flex-wrap gap-1">
                <Badge>{STATE_LABEL[e.studyState]}</Badge>
                {e.enrollmentState === "withdrawn" && <Badge tone="signal">Your lab withdrawn</Badge>}
              </span>,
              `${e.submittedCells} cells`,
              e.resultsDue ?? "—",
            ])}
          />
        )}
        <Pager page={loaderData.page.page} pageCount={loaderData.page.pageCount} label="Your lab's study pages" />
      </Card>
    </>
  );
}
