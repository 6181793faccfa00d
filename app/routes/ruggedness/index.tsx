import { Link } from "react-router";
import type { Route } from "./+types/index";
import { StateBadge } from "~/components/state-badge";
import { ListPage } from "~/components/list-page";
import { STUDY_STATE } from "~/lib/state-labels";
import { listRuggednessStudies } from "~/models/ruggedness.server";
import { requireRole } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Ruggedness studies · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "coordinator", "admin");
  return { studies: await listRuggednessStudies(user), canCreate: user.roles.includes("coordinator") };
}

export default function RuggednessStudies({ loaderData }: Route.ComponentProps) {
  const { studies, canCreate } = loaderData;
  return (
    <ListPage
      title="Ruggedness studies"
      subtitle="Before a round robin: find, in your own lab, which details of the procedure must be held tightly (ASTM E1169 screening designs)."
      newRecord={canCreate ? { to: "/ruggedness/new", label: "New ruggedness study" } : undefined}
      empty="No ruggedness studies yet."
      caption="Ruggedness studies"
      headers={["Code", "Title", "Test method", "Design", "State"]}
      rows={studies.map((s) => [
        <Link key="code" to={`/ruggedness/${s.id}`} className="keep-whole font-semibold underline">
          {s.code}
        </Link>,
        s.title,
        s.testMethod,
        s.runs ? `${s.runs} runs` : "not laid out",
        <StateBadge key="state" view={STUDY_STATE[s.state]} />,
      ])}
    />
  );
}
