import { Link } from "react-router";
import type { Route } from "./+types/results";
import { CellStatusBadge } from "~/components/cell-status-badge";
import { MaterialPicker } from "~/components/material-picker";
import { StateBadge } from "~/components/state-badge";
import { StudyDownloads } from "~/components/study-downloads";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Card, SimpleTable } from "~/components/ui";
import { describeAuditEvent } from "~/lib/audit-sentences";
import { formatDateTime } from "~/lib/format";
import { wholeNumberParam } from "~/lib/query-params";
import { ENROLLMENT_STATE } from "~/lib/state-labels";
import { studyPageMeta } from "~/lib/study-page-meta";
import { requireStudy } from "~/server/study-context.server";
import { studyBatchMarks } from "~/models/batch.server";
import { studyAuditTrail, studyResults } from "~/models/results.server";

export const handle = { pageTitle: "Results" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ request, context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  const search = new URL(request.url).searchParams;
  const pageParam = (name: string) => wholeNumberParam(search, name) ?? 1;
  const [table, audit, marks] = await Promise.all([
    studyResults(study.id, pageParam("labs"), search.get("material")),
    studyAuditTrail(study.id, pageParam("page")),
    studyBatchMarks(study.id),
  ]);
  const marksByCell = new Map(marks.map((m) => [`${m.enrollmentId}:${m.materialId}`, m.readings]));
  const rows = table.rows.map((row) => ({ ...row, fresh: marksByCell.get(`${row.enrollmentId}:${row.materialId}`) ?? [] }));
  return {
    study: { id: study.id, code: study.code, title: study.title },
    materials: table.materials.map((m) => ({ code: m.code, description: m.description })),
    material: table.material,
    responses: table.responses.map((r) => ({ key: r.key, name: r.name })),
    rows,
    labsPage: table.labsPage,
    labsPageCount: table.labsPageCount,
    audit,
  };
}

/** A link to one page of the results table and one page of the audit trail. */
const pageLink = (material: string | null, labs: number, page: number) =>
  `?${new URLSearchParams({ ...(material ? { material } : {}), labs: String(labs), page: String(page) })}`;

export default function StudyResults({ loaderData }: Route.ComponentProps) {
  const { study, responses, rows, labsPage, labsPageCount, audit, materials, material } = loaderData;
  const amendmentRows = rows.flatMap((r) => r.amendments.map((a) => ({ ...a, labCode: r.labCode, materialCode: r.materialCode })));
  return (
    <div className="grid gap-6 [&>*]:min-w-0">
      <Card title="Results by lab and material">
        <StudyDownloads studyId={study.id} what="results" />
        <div className="mb-3">
          <MaterialPicker materials={materials} shown={material} drop={["labs"]} />
        </div>
        <SimpleTable
          caption="Replicate results by lab, material and response, with cell status"
          headers={["Lab code", "Lab", "Material", ...responses.map((r) => r.name), "Fresh properties"]}
          rows={rows.map((row) => [
            row.labCode ?? "—",
            row.withdrawn ? (
              <span key="lab" className="flex flex-wrap items-center gap-2">
                {row.labName} <StateBadge view={ENROLLMENT_STATE.withdrawn} />
              </span>
            ) : (
              row.labName
            ),
            row.materialCode,
            ...row.cells.map((cell) => (
              <span key={cell.responseKey} className="flex flex-wrap items-center gap-2">
                <CellStatusBadge status={cell.status} />
                <span>{cell.values.map((v) => v.value).join(", ") || "—"}</span>
              </span>
            )),
            row.fresh.length === 0 ? (
              "—"
            ) : (
              <ul key="fresh" className="text-sm">
                {row.fresh.map((f) => (
                  <li key={f.property}>
                    {f.label} {f.value} {f.unit} {f.outside && <Badge tone="signal">Outside tolerance</Badge>}
                  </li>
                ))}
              </ul>
            ),
          ])}
        />
        {labsPageCount > 1 && (
          <nav aria-label="Results pages" className="mt-3 flex gap-4">
            <span>
              Labs page {labsPage} of {labsPageCount}
            </span>
            {labsPage > 1 && (
              <Link to={pageLink(material, labsPage - 1, audit.page)} className="font-semibold text-basalt-700 underline">
                Previous labs
              </Link>
            )}
            {labsPage < labsPageCount && (
              <Link to={pageLink(material, labsPage + 1, audit.page)} className="font-semibold text-basalt-700 underline">
                Next labs
              </Link>
            )}
          </nav>
        )}
      </Card>
      <Card title="Amendments">
        {amendmentRows.length === 0 ? (
          <p>No submitted result has been amended.</p>
        ) : (
          <SimpleTable
            caption="Amendments of submitted results"
            headers={["When", "Lab code", "Cell", "Old → new", "Reason", "By"]}
            rows={amendmentRows.map((a) => [
              formatDateTime(a.createdAt),
              a.labCode ?? "—",
              `${a.materialCode} ${a.responseKey} #${a.replicate}`,
              `${a.oldValue ?? "—"} → ${a.newValue}`,
              a.reason,
              a.byName,
            ])}
          />
        )}
      </Card>
      <Card title="Audit trail">
        {audit.total === 0 ? (
          <p className="text-basalt-700">Every submission, amendment, import and answer is listed here, newest first. Nothing has been recorded yet.</p>
        ) : (
          <>
            <p className="mb-2 text-basalt-700">
              Every submission, amendment, import and answer, newest first. {audit.total} {audit.total === 1 ? "event" : "events"}; page {audit.page} of{" "}
              {audit.pageCount}.
            </p>
            <SimpleTable
              caption="Audit trail of the study"
              headers={["When", "Who", "What happened"]}
              rows={audit.events.map((e) => [
                <span key="when" className="whitespace-nowrap tabular-nums">
                  {formatDateTime(e.createdAt)}
                </span>,
                e.actorName ?? "—",
                describeAuditEvent(e),
              ])}
            />
          </>
        )}
        <nav aria-label="Audit trail pages" className="mt-3 flex gap-4">
          {audit.page > 1 && (
            <Link to={pageLink(material, labsPage, audit.page - 1)} className="font-semibold text-basalt-700 underline">
              Newer events
            </Link>
          )}
          {audit.page < audit.pageCount && (
            <Link to={pageLink(material, labsPage, audit.page + 1)} className="font-semibold text-basalt-700 underline">
              Older events
            </Link>
          )}
        </nav>
      </Card>
    </div>
  );
}
