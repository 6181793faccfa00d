import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { Badge, Card, PageHeader, SimpleTable } from "~/components/ui";
import { requireRole } from "~/server/guards.server";
import { awaitedVotes } from "~/models/review.server";
import { listReviewedStudies } from "~/models/study.server";
import { STUDY_STATE } from "~/lib/state-labels";

export const meta: Route.MetaFunction = () => [{ title: "Reviews · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "reviewer");
  const [studies, awaited] = await Promise.all([listReviewedStudies(user.id), awaitedVotes(user.id)]);
  return { studies: studies.map((s) => ({ ...s, voteAwaited: awaited.get(s.id) ?? false })) };
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
            headers={["Code", "Title", "State", "Your vote"]}
            rows={loaderData.studies.map((s) => [
              <Link key="code" to={`/review/${s.id}`} className="keep-whole font-semibold text-basalt-700 underline">
                {s.code}
              </Link>,
              s.title,
              <StateBadge key="state" view={STUDY_STATE[s.state]} />,
              s.voteAwaited ? (
                <Badge key="vote" tone="ochre">
                  Awaited
                </Badge>
              ) : (
                "—"
              ),
            ])}
          />
        )}
      </Card>
    </>
  );
}
