import type { Route } from "./+types/protocol";
import type { StudyPageHandle } from "~/components/study-frame";
import { StudyTargets } from "~/components/study-targets";
import { Card } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { studyPageMeta } from "~/lib/study-page-meta";
import { freshTargets } from "~/models/batch.server";
import { studyBrief } from "~/models/study.server";
import { requireStudy } from "~/server/study-context.server";

export const handle = { pageTitle: "Protocol and targets" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** What the lab tests to: the protocol file, the fresh-property targets, the plan of the study and whom to ask. */
export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["analyst"]);
  const [targets, brief] = await Promise.all([freshTargets(study.id), studyBrief(study)]);
  return {
    study: {
      testMethod: study.testMethod,
      replicatesPerCell: study.replicatesPerCell,
      targetSurfaceRating: study.targetSurfaceRating,
      specimenVolumeM3: study.specimenVolumeM3,
      wastePercent: study.wastePercent,
      shipDate: study.shipDate,
      resultsDue: study.resultsDue,
    },
    targets,
    ...brief,
  };
}

export default function ProtocolPage({ loaderData }: Route.ComponentProps) {
  const { study, targets, protocol, coordinator } = loaderData;
  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      <Card title="Protocol">
        {protocol ? (
          <p>
            <a href={`/files/${protocol.id}`} className="font-semibold text-basalt-700 underline">
              Download the protocol ({protocol.originalName})
            </a>
          </p>
        ) : (
          <p>The coordinator has not attached a protocol file yet.</p>
        )}
        <dl className="mt-4 grid gap-x-6 gap-y-2 sm:grid-cols-2">
          <div>
            <dt className="text-sm text-basalt-700">Test method</dt>
            <dd className="font-semibold">{study.testMethod}</dd>
          </div>
          <div>
            <dt className="text-sm text-basalt-700">Replicates per material</dt>
            <dd className="font-semibold tabular-nums">{study.replicatesPerCell}</dd>
          </div>
          <div>
            <dt className="text-sm text-basalt-700">Concrete per specimen</dt>
            <dd className="font-semibold tabular-nums">
              {study.specimenVolumeM3 === null ? "not given" : `${study.specimenVolumeM3} m³, plus ${study.wastePercent ?? 0} % waste allowance`}
            </dd>
          </div>
          <div>
            <dt className="text-sm text-basalt-700">Materials ship · results due</dt>
            <dd className="whitespace-nowrap font-semibold tabular-nums">
              {formatDate(study.shipDate)} · {formatDate(study.resultsDue)}
            </dd>
          </div>
          {coordinator && (
            <div>
              <dt className="text-sm text-basalt-700">Coordinator</dt>
              <dd>
                {coordinator.name},{" "}
                <a href={`mailto:${coordinator.email}`} className="text-basalt-700 underline">
                  {coordinator.email}
                </a>
              </dd>
            </div>
          )}
        </dl>
      </Card>
      <Card title="Targets">
        <StudyTargets targets={targets} targetSurfaceRating={study.targetSurfaceRating} />
        <p className="mt-3 text-sm text-basalt-700">A batch outside a target's tolerance is still recorded; the coordinator sees the mark and decides.</p>
      </Card>
    </div>
  );
}
