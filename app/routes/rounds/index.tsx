import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { ListPage } from "~/components/list-page";
import { formatDate } from "~/lib/format";
import { STUDY_STATE } from "~/lib/state-labels";
import { listRounds } from "~/models/round.server";
import { requireRole } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Proficiency rounds · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator", "admin");
  return { rounds: await listRounds(user), canCreate: user.roles.includes("coordinator") };
}

export default function Rounds({ loaderData }: Route.ComponentProps) {
  const { rounds, canCreate } = loaderData;
  return (
    <ListPage
      title="Proficiency rounds"
      subtitle="Rounds score each lab against an assigned value (ISO 13528) and send each lab a confidential letter."
      newRecord={canCreate ? { to: "/rounds/new", label: "New round" } : undefined}
      empty="No rounds yet."
      caption="Proficiency rounds"
      headers={["Code", "Title", "State", "Results due"]}
      rows={rounds.map((round) => [
        <Link key="code" to={`/rounds/${round.id}`} className="keep-whole font-semibold text-basalt-700 underline">
          {round.code}
        </Link>,
        round.title,
        <StateBadge key="state" view={STUDY_STATE[round.state]} />,
        formatDate(round.resultsDue),
      ])}
    />
  );
}
