import type { Route } from "./+types/index";
import { ListPage, recordLink, stateCell } from "~/components/list-page";
import { listRuggednessStudies } from "~/models/ruggedness.server";
import { requireStudyListReader } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Ruggedness studies · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const { user, canCreate } = await requireStudyListReader(request);
  return { studies: await listRuggednessStudies(user), canCreate };
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
        recordLink(`/ruggedness/${s.id}`, s.code),
        s.title,
        s.testMethod,
        s.runs ? `${s.runs} runs` : "not laid out",
        stateCell(s.state),
      ])}
    />
  );
}
