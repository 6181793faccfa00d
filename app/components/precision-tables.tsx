/**
 * The precision figures of an analysis, shared by the coordinator's analysis
 * page, the committee's review page and the printed report: per response a
 * table of the materials' precision statistics, and per material a sortable
 * table of the labs' cell statistics with flagged cells marked in text, not
 * by colour alone. Labs appear by code only.
 */
import { type ReactNode, useMemo } from "react";
import { type DataColumn, DataTable } from "~/components/data-table";
import { Badge, SimpleTable } from "~/components/ui";
import type { GroupResult, LabResult, StudyAnalysis } from "~/lib/precision";
import { labClasses } from "~/lib/review/flags";
import { figureDecimals, formatFigure } from "~/lib/review/format";

export type ResponseInfo = { key: string; name: string; unit: string; decimals: number };

function FlagMark({ children }: { children: ReactNode }) {
  return (
    <span className="ml-1 inline-flex items-center gap-0.5 rounded bg-signal-100 px-1.5 text-sm font-bold text-signal-700">
      <span aria-hidden="true">⚑</span>
      {children}
    </span>
  );
}

const CLASS_TONE = { straggler: "ochre", outlier: "signal" } as const;

function ClassBadge({ value }: { value: "straggler" | "outlier" | null }) {
  return value ? <Badge tone={CLASS_TONE[value]}>{value}</Badge> : <span className="text-basalt-700">—</span>;
}

/** The h or k column: the lab's statistic, marked where it flags the lab. */
function consistencyColumn(statistic: "h" | "k", decimals: number): DataColumn<LabResult> {
  return {
    id: statistic,
    header: statistic,
    value: (l) => l[statistic],
    cell: (l) => (
      <>
        {formatFigure(l[statistic], decimals)}
        {l.flags.includes(statistic) && <FlagMark>{statistic}</FlagMark>}
      </>
    ),
  };
}

export function PrecisionSummaryTable({ analysis, response }: { analysis: StudyAnalysis; response: ResponseInfo }) {
  const d = figureDecimals(response.decimals);
  const groups = analysis.groups.filter((g) => g.response === response.key);
  return (
    <SimpleTable
      caption={`Precision statistics of ${response.name} by material`}
      headers={["Material", "p", "n", "x̿", "s_x̄", "s_r", "s_L", "s_R", "r", "R", "CV_r %", "CV_R %"]}
      rows={groups.map((g) =>
        g.status === "computed"
          ? [
              g.material,
              g.p,
              formatFigure(g.n, Number.isInteger(g.n) ? 0 : 2),
              formatFigure(g.mean, d.mean),
              formatFigure(g.sx, d.sd),
              formatFigure(g.sr, d.sd),
              formatFigure(g.sL, d.sd),
              formatFigure(g.sR, d.sd),
              formatFigure(g.r, d.limit),
              formatFigure(g.R, d.limit),
              formatFigure(g.cvr, 1),
              formatFigure(g.cvR, 1),
            ]
          : [g.material, g.p, formatFigure(g.n, 0), <span key="why" className="text-basalt-700">not computed: {g.reasons.join("; ")}</span>, "", "", "", "", "", "", "", ""],
      )}
    />
  );
}

export function LabTable({
  group,
  response,
  labAction,
  headingLevel = 3,
}: {
  group: GroupResult;
  response: ResponseInfo;
  labAction?: (group: GroupResult, lab: LabResult) => ReactNode;
  headingLevel?: 3 | 4;
}) {
  const Heading = headingLevel === 3 ? "h3" : "h4";
  const d = figureDecimals(response.decimals);
  const computed = group.status === "computed" ? group : null;
  const columns = useMemo(() => {
    const list: DataColumn<LabResult>[] = [
      {
        id: "lab",
        header: "Lab",
        value: (l) => l.lab,
        cell: (l) => (
          <span className="font-semibold">
            {l.lab}
            {l.flags.length > 0 && <FlagMark>flagged</FlagMark>}
          </span>
        ),
      },
      { id: "mean", header: "Cell average", value: (l) => l.mean, cell: (l) => formatFigure(l.mean, d.mean) },
      { id: "sd", header: "s", value: (l) => l.sd, cell: (l) => formatFigure(l.sd, d.sd) },
      { id: "d", header: "d", value: (l) => l.d, cell: (l) => formatFigure(l.d, d.mean) },
      consistencyColumn("h", d.ratio),
      consistencyColumn("k", d.ratio),
      { id: "flags", header: "Flags", value: (l) => l.flags.join(", ") || null, cell: (l) => l.flags.join(", ") || "none" },
      { id: "cochran", header: "Cochran", value: (l) => labClasses(group, l.lab).cochran, cell: (l) => <ClassBadge value={labClasses(group, l.lab).cochran} /> },
      {
        id: "grubbs",
        header: "Grubbs",
        value: (l) => labClasses(group, l.lab).grubbs,
        cell: (l) => {
          const c = labClasses(group, l.lab);
          return c.grubbs ? <Badge tone={CLASS_TONE[c.grubbs]}>{`${c.grubbs} (${c.grubbsSide})`}</Badge> : <ClassBadge value={null} />;
        },
      },
    ];
    if (labAction) list.push({ id: "action", header: "Investigate", value: () => null, cell: (l) => labAction(group, l), sortable: false });
    return list;
  }, [group, labAction, d.mean, d.sd, d.ratio]);
  return (
    // Printed, each material's table starts a page.
    <div className="print-page-break">
      <Heading className="mb-1 font-semibold text-basalt-800">
        {group.material} · {response.name}
      </Heading>
      <p className="mb-2 text-sm text-basalt-700">
        {computed
          ? `${group.p} labs, n = ${formatFigure(group.n, Number.isInteger(group.n) ? 0 : 2)}. A lab is flagged when |h| > ${computed.hCritical.toFixed(2)} or k > ${computed.kCritical.toFixed(2)}.`
          : `Cell statistics only: ${group.status === "not-computed" ? group.reasons.join("; ") : ""}`}
      </p>
      <DataTable caption={`Labs on ${group.material}, ${response.name}`} columns={columns} data={group.labs} filterLabel={`Find a lab on ${group.material}, ${response.key}`} />
    </div>
  );
}

/** Every response of the analysis: its summary, then each material's lab table (or only `material`'s). */
export function PrecisionTables({
  analysis,
  responses,
  labAction,
  headingLevel = 2,
  material,
}: {
  analysis: StudyAnalysis;
  responses: ResponseInfo[];
  labAction?: (group: GroupResult, lab: LabResult) => ReactNode;
  headingLevel?: 2 | 3;
  material?: string | null;
}) {
  const Heading = headingLevel === 2 ? "h2" : "h3";
  return (
    <div className="flex flex-col gap-8">
      {responses.map((response) => (
        <section key={response.key} aria-labelledby={`response-${response.key}`} className="flex flex-col gap-4">
          <Heading id={`response-${response.key}`} className="text-xl font-semibold text-basalt-900">
            {response.name}
            {response.unit && <span className="font-normal text-basalt-700"> ({response.unit})</span>}
          </Heading>
          <PrecisionSummaryTable analysis={analysis} response={response} />
          {analysis.groups
            .filter((g) => g.response === response.key && (material == null || g.material === material))
            .map((group) => (
              <LabTable key={group.material} group={group} response={response} labAction={labAction} headingLevel={headingLevel === 2 ? 3 : 4} />
            ))}
        </section>
      ))}
    </div>
  );
}
