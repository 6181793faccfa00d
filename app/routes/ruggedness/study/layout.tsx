import type { Route } from "./+types/layout";
import { StudyFrame, type StudyTab } from "~/components/study-frame";
import { requireRuggednessStudy, ruggednessAccessMiddleware } from "~/server/ruggedness-context.server";

// A ruggedness study is its coordinator's own work in one lab; admins read it.
export const middleware: Route.MiddlewareFunction[] = [ruggednessAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  return { study: { id: study.id, code: study.code, title: study.title, state: study.state } };
}

const TABS: [path: string, label: string][] = [
  ["", "Factors"],
  ["/design", "Design & run sheet"],
  ["/results", "Results"],
  ["/effects", "Effects"],
  ["/conclusions", "Conclusions"],
];

export default function RuggednessLayout({ loaderData }: Route.ComponentProps) {
  const { study } = loaderData;
  const base = `/ruggedness/${study.id}`;
  const tabs: StudyTab[] = TABS.map(([path, label]) => ({ to: base + path, label, end: path === "" }));
  return <StudyFrame study={study} tabs={tabs} />;
}
