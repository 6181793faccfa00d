import type { Route } from "./+types/layout";
import { StudyFrame } from "~/components/study-frame";
import { enrollmentEnded } from "~/server/guards.server";
import { requireStudy, studyAccessMiddleware } from "~/server/study-context.server";

export const middleware: Route.MiddlewareFunction[] = [studyAccessMiddleware(["analyst"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireStudy(context, ["analyst"], { endedEnrollment: true });
  return { study: { id: study.id, code: study.code, title: study.title, state: study.state }, labCode: enrollment!.labCode, ended: enrollmentEnded(enrollment) };
}

export default function LabStudyLayout({ loaderData }: Route.ComponentProps) {
  const { study, labCode, ended } = loaderData;
  const base = `/lab/studies/${study.id}`;
  return (
    <StudyFrame
      study={study}
      detail={<> · your lab code <span className="whitespace-nowrap font-semibold">{labCode ?? "—"}</span></>}
      tabs={
        ended
          ? [{ to: base, label: "Tasks", end: true }]
          : [
              { to: base, label: "Tasks", end: true },
              { to: `${base}/protocol`, label: "Protocol and targets" },
              { to: `${base}/receipt`, label: "Receipt" },
              { to: `${base}/import`, label: "Import" },
            ]
      }
    />
  );
}
