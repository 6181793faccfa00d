import type { Route } from "./+types/index";
import { ListPage, recordLink, stateCell } from "~/components/list-page";
import { formatDate } from "~/lib/format";
import { listRounds } from "~/models/round.server";
import { requireStudyListReader } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Proficiency rounds · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const { user, canCreate } = await requireStudyListReader(request);
  return { rounds: await listRounds(user), canCreate };
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
        recordLink(`/rounds/${round.id}`, round.code),
        round.title,
        stateCell(round.state),
        formatDate(round.resultsDue),
      ])}
    />
  );
}
