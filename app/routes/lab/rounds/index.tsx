import { Link } from "react-router";
import type { Route } from "./+types/index";
import { ListPage, recordLink, stateCell } from "~/components/list-page";
import { labRounds } from "~/models/round.server";
import { requireRole } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Proficiency rounds · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  return { rounds: await labRounds(user.labIds) };
}

export default function LabRounds({ loaderData }: Route.ComponentProps) {
  return (
    <ListPage
      title="Proficiency rounds"
      subtitle="Rounds your lab takes part in; each published round has a confidential letter for your lab."
      empty="Your lab takes part in no round yet."
      caption="Your lab's proficiency rounds"
      headers={["Round", "Title", "Your lab code", "State", "Letter"]}
      rows={loaderData.rounds.map((round) => [
        recordLink(`/lab/rounds/${round.id}`, round.code),
        round.title,
        round.labCode ?? "—",
        stateCell(round.state),
        round.state === "published" ? (
          <Link key="letter" to={`/lab/rounds/${round.id}/letter`} className="font-semibold text-basalt-700 underline">
            Read the letter
          </Link>
        ) : (
          "After publication"
        ),
      ])}
    />
  );
}
