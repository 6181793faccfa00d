import type { Route } from "./+types/layout";
import { frameStudy, framedStudyLayout } from "~/components/study-frame";
import { requireRuggednessStudy, ruggednessAccessMiddleware } from "~/server/ruggedness-context.server";

// A ruggedness study is its coordinator's own work in one lab; admins read it.
export const middleware: Route.MiddlewareFunction[] = [ruggednessAccessMiddleware(["coordinator", "admin"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  return { study: frameStudy(study) };
}

export default framedStudyLayout("/ruggedness", [
  ["", "Factors"],
  ["/design", "Design & run sheet"],
  ["/results", "Results"],
  ["/effects", "Effects"],
  ["/conclusions", "Conclusions"],
]);
