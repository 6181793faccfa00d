import type { Route } from "./+types/layout";
import { StudyFrame, frameStudy, tabsUnder } from "~/components/study-frame";
import { requireRuggednessStudy, ruggednessAccessMiddleware } from "~/server/ruggedness-context.server";

// A ruggedness study is its coordinator's own work in one lab; admins read it.
export const middleware: Route.MiddlewareFunction[] = [ruggednessAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  return { study: frameStudy(study) };
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
  return <StudyFrame study={study} tabs={tabsUnder(`/ruggedness/${study.id}`, TABS)} />;
}
