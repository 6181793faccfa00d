import { Link } from "react-router";
import type { Route } from "./+types/index";
import { Badge, Card, PageHeader, SimpleTable } from "~/components/ui";
import { requireRole } from "~/server/guards.server";
import { coordinatedStudiesPage } from "~/models/study.server";
import { requestedPage } from "~/lib/paging";
import { Pager } from "~/components/pager";
import { STATE_LABEL } from "~/lib/state-labels";

export const meta: Route.MetaFunction = () => [{ title: "Studies · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator", "admin");
  const { rows, ...page } = await coordinatedStudiesPage(user, requestedPage(new URL(request.url).searchParams));
  return { studies: rows, page, everyStudy: user.role === "admin" };
}

export default function Studies({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="Studies"
        subtitle={loaderData.everyStudy ? "Every interlaboratory study, read-only for administrators." : "Interlaboratory studies you coordinate. Start one with New study in the menu above."}
      />
      <Card>
        {loaderData.studies.length === 0 ? (
          <p>No studies yet.</p>
        ) : (
          <SimpleTable
            caption="Studies you coordinate"
            headers={["Code", "Title", "Test method", "State", "Results due"]}
            rows={loaderData.studies.map((s) => [
              <Link key="code" to={`/studies/${s.id}`} className="font-semibold text-basalt-700 underline">
                {s.code}
              </Link>,
              s.title,
              s.testMethod,
              <Badge key="state">{STATE_LABEL[s.state]}</Badge>,
              s.resultsDue ?? "—",
            ])}
          />
        )}
        <Pager page={loaderData.page.page} pageCount={loaderData.page.pageCount} label="Study list pages" />
      </Card>
    </>
  );
}
