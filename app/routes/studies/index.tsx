import { Link } from "react-router";
import type { Route } from "./+types/index";
import { Pager } from "~/components/pager";
import { StateBadge } from "~/components/state-badge";
import { Card, PageHeader, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { requestedPage } from "~/lib/paging";
import { STUDY_STATE } from "~/lib/state-labels";
import { coordinatedStudiesPage } from "~/models/study.server";
import { requireRole } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Studies · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator", "admin");
  const { rows, ...page } = await coordinatedStudiesPage(user, requestedPage(new URL(request.url).searchParams));
  return { studies: rows, page, everyStudy: user.roles.includes("admin") };
}

export default function Studies({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="Studies"
        subtitle={
          loaderData.everyStudy
            ? "Every interlaboratory study, read-only for administrators."
            : "Interlaboratory studies you coordinate. Start one with New study in the menu above."
        }
      />
      <Card>
        {loaderData.studies.length === 0 ? (
          <p>No studies yet.</p>
        ) : (
          <SimpleTable
            caption={loaderData.everyStudy ? "All studies" : "Studies you coordinate"}
            headers={["Code", "Title", "Test method", "State", "Results due"]}
            rows={loaderData.studies.map((s) => [
              <Link key="code" to={`/studies/${s.id}`} className="keep-whole font-semibold text-basalt-700 underline">
                {s.code}
              </Link>,
              s.title,
              s.testMethod,
              <StateBadge key="state" view={STUDY_STATE[s.state]} />,
              formatDate(s.resultsDue),
            ])}
          />
        )}
        <Pager page={loaderData.page.page} pageCount={loaderData.page.pageCount} label="Study list pages" />
      </Card>
    </>
  );
}
