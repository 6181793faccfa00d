import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { Card, PageHeader, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { STUDY_STATE } from "~/lib/state-labels";
import { listRounds } from "~/models/round.server";
import { requireRole } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Proficiency rounds · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator", "admin");
  return { rounds: await listRounds(user), canCreate: user.role === "coordinator" };
}

export default function Rounds({ loaderData }: Route.ComponentProps) {
  const { rounds, canCreate } = loaderData;
  return (
    <>
      <PageHeader
        title="Proficiency rounds"
        subtitle="Rounds score each lab against an assigned value (ISO 13528) and send each lab a confidential letter."
        actions={
          canCreate && (
            <Link to="/rounds/new" className="inline-flex min-h-11 items-center rounded-md bg-basalt-700 px-4 py-2 font-semibold text-white">
              New round
            </Link>
          )
        }
      />
      <Card>
        {rounds.length === 0 ? (
          <p>No rounds yet.</p>
        ) : (
          <SimpleTable
            caption="Proficiency rounds"
            headers={["Code", "Title", "State", "Results due"]}
            rows={rounds.map((round) => [
              <Link key="code" to={`/rounds/${round.id}`} className="font-semibold text-basalt-700 underline">
                {round.code}
              </Link>,
              round.title,
              <StateBadge key="state" view={STUDY_STATE[round.state]} />,
              formatDate(round.resultsDue),
            ])}
          />
        )}
      </Card>
    </>
  );
}
