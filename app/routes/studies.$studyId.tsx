import type { Route } from "./+types/studies.$studyId";
import { Badge, Card, PageHeader, SimpleTable } from "~/components/ui";
import { requireStudyAccess } from "~/lib/guards.server";
import { type CellStatus, studyMatrix } from "~/models/study.server";
import { STATE_LABEL } from "~/lib/study-states";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.study.code ?? "Study"} · Ringbatch` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const { study } = await requireStudyAccess(request, params.studyId, ["coordinator", "admin"]);
  return { study, matrix: await studyMatrix(study.id) };
}

const STATUS_VIEW: Record<CellStatus, { label: string; tone: "neutral" | "ochre" | "leaf" | "signal" }> = {
  not_started: { label: "Not started", tone: "neutral" },
  draft: { label: "Draft", tone: "ochre" },
  submitted: { label: "Submitted", tone: "leaf" },
  amended: { label: "Amended", tone: "signal" },
};

export default function StudyOverview({ loaderData }: Route.ComponentProps) {
  const { study, matrix } = loaderData;
  const submitted = matrix.rows.flatMap((r) => r.statuses).filter((s) => s === "submitted" || s === "amended").length;
  const total = matrix.rows.length * matrix.materials.length;
  return (
    <>
      <PageHeader
        title={`${study.code} — ${study.title}`}
        subtitle={
          <>
            {study.testMethod} · <Badge>{STATE_LABEL[study.state]}</Badge> · {study.replicatesPerCell} replicates per cell
            {study.resultsDue && <> · results due {study.resultsDue}</>}
          </>
        }
      />
      <Card title="Progress">
        <p className="mb-2">
          {submitted} of {total} lab × material results submitted
        </p>
        <progress className="mb-4 h-3 w-full" max={total || 1} value={submitted} aria-label="Submitted lab × material results" />
        <SimpleTable
          caption="Cell status by lab and material"
          headers={["Lab code", "Lab", ...matrix.materials.map((m) => m.code)]}
          rows={matrix.rows.map((row) => [
            row.labCode ?? "—",
            row.labName,
            ...row.statuses.map((status, i) => (
              <Badge key={i} tone={STATUS_VIEW[status].tone}>
                {STATUS_VIEW[status].label}
              </Badge>
            )),
          ])}
        />
      </Card>
    </>
  );
}
