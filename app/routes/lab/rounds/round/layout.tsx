import type { Route } from "./+types/layout";
import { StudyFrame } from "~/components/study-frame";
import { requireRound, roundAccessMiddleware } from "~/server/round-context.server";

// Only an enrolled lab's analysts; each sees its own lab only.
export const middleware: Route.MiddlewareFunction[] = [roundAccessMiddleware(["analyst"])];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireRound(context, ["analyst"]);
  return { round: { id: study.id, code: study.code, title: study.title, state: study.state }, labCode: enrollment!.labCode };
}

export default function LabRoundLayout({ loaderData }: Route.ComponentProps) {
  const { round, labCode } = loaderData;
  const base = `/lab/rounds/${round.id}`;
  return (
    <StudyFrame
      study={round}
      detail={<> · your lab code <span className="whitespace-nowrap font-semibold">{labCode ?? "—"}</span></>}
      tabs={[
        { to: base, label: "Round", end: true },
        { to: `${base}/letter`, label: "Letter" },
      ]}
    />
  );
}
