import type { Route } from "./+types/review";
import { Badge, Card, PageHeader, SimpleTable } from "~/components/ui";
import { requireRole } from "~/lib/guards.server";
import { listReviewedStudies } from "~/models/study.server";
import { STATE_LABEL } from "~/lib/study-states";

export const meta: Route.MetaFunction = () => [{ title: "Reviews · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "reviewer");
  return { studies: await listReviewedStudies(user.id) };
}

export default function ReviewHome({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Reviews" subtitle="Studies whose precision statement you review for the committee. Labs appear by code only." />
      <Card>
        {loaderData.studies.length === 0 ? (
          <p>No study has been assigned to you for review.</p>
        ) : (
          <SimpleTable
            caption="Studies assigned to you"
            headers={["Code", "Title", "State"]}
            rows={loaderData.studies.map((s) => [s.code, s.title, <Badge key="state">{STATE_LABEL[s.state]}</Badge>])}
          />
        )}
      </Card>
    </>
  );
}
