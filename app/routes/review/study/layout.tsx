import type { Route } from "./+types/layout";
import { StudyFrame } from "~/components/study-frame";
import { requireStudy, studyAccessMiddleware } from "~/server/study-context.server";

export const middleware: Route.MiddlewareFunction[] = [studyAccessMiddleware(["reviewer"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["reviewer"]);
  return { study: { id: study.id, code: study.code, title: study.title, state: study.state } };
}

export default function ReviewStudyLayout({ loaderData }: Route.ComponentProps) {
  return <StudyFrame study={loaderData.study} detail=" · labs appear by code only" tabs={[]} />;
}
