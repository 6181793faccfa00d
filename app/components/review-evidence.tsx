/**
 * The evidence a committee reviewer weighs before voting, blinded: every cell
 * decision with its reason, and one material at a time every lab's replicate
 * values, cell statistics and findings with their critical values.
 */
import type { ResponseInfo } from "~/components/precision-tables";
import { StateBadge } from "~/components/state-badge";
import { SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import type { CellRecord, DecisionOnRecord, QueryOnRecord, ResponseRecord } from "~/lib/review/evidence";
import { figureDecimals, formatFigure } from "~/lib/review/format";
import { CELL_DECISION, QUERY_STATE } from "~/lib/state-labels";

const cellKey = (c: { lab: string; material: string; response: string }) => `${c.lab}:${c.material}:${c.response}`;

/** The queries on one cell, oldest first: what the coordinator asked and what the lab answered. */
function CellQueries({ queries }: { queries: QueryOnRecord[] }) {
  if (queries.length === 0) return null;
  return (
    <ul aria-label="Queries on this cell" className="mt-2 flex flex-col gap-2 border-l-4 border-basalt-200 pl-3">
      {queries.map((q) => (
        <li key={`${q.askedAt}:${q.question}`}>
          <p className="flex flex-wrap items-center gap-x-2 text-sm text-basalt-700">
            <span>
              Query asked <span className="keep-whole">{formatDate(q.askedAt)}</span>
            </span>
            <StateBadge view={QUERY_STATE[q.state]} />
          </p>
          {q.statistic && <p className="text-sm text-basalt-700">Prompted by {q.statistic}</p>}
          <p>{q.question}</p>
          <p className="mt-1">
            <span className="font-semibold">
              Lab <span className="keep-whole">{q.lab}</span> answered{q.answeredAt && <> <span className="keep-whole">{formatDate(q.answeredAt)}</span></>}:
            </span>{" "}
            {q.answer ?? <span className="text-basalt-700">no answer yet.</span>}
          </p>
        </li>
      ))}
    </ul>
  );
}

function CellHeading({ cell }: { cell: { lab: string; material: string; response: string } }) {
  return (
    <span>
      Lab <span className="keep-whole">{cell.lab}</span> · <span className="keep-whole">{cell.material}</span> · {cell.response}
    </span>
  );
}

/** Every cell decision with its reason and the queries behind it; then the queries on cells the coordinator has not decided. */
export function DecisionsOnRecord({ decisions, queries }: { decisions: DecisionOnRecord[]; queries: QueryOnRecord[] }) {
  // Newest first from the model; a cell's exchange reads oldest first.
  const queriesOf = (key: string) => queries.filter((q) => cellKey(q) === key).toReversed();
  const decided = new Set(decisions.map(cellKey));
  const undecidedCells = [...new Set(queries.map(cellKey))].filter((key) => !decided.has(key));
  return (
    <>
      {decisions.length === 0 ? (
        <p>The coordinator has recorded no cell decision: every submitted cell is in the analysis.</p>
      ) : (
        // A list rather than a table: each reason reads as a paragraph, on a phone too.
        <ul aria-label="Cell decisions, retained and excluded, with their reasons" className="flex flex-col gap-2">
          {decisions.map((d) => (
            <li key={cellKey(d)} className="rounded border border-basalt-100 p-3">
              <p className="flex flex-wrap items-center gap-x-2 font-semibold text-basalt-800">
                <CellHeading cell={d} />
                <StateBadge view={CELL_DECISION[d.decision]} />
                <span className="keep-whole text-sm font-normal text-basalt-700">decided {formatDate(d.decidedAt)}</span>
              </p>
              <p className="mt-1">{d.reason}</p>
              <CellQueries queries={queriesOf(cellKey(d))} />
            </li>
          ))}
        </ul>
      )}
      {undecidedCells.length > 0 && (
        <>
          <h3 className="mt-4 mb-1 font-semibold text-basalt-800">Queries on cells without a decision</h3>
          <ul aria-label="Queries on cells without a decision" className="flex flex-col gap-2">
            {undecidedCells.map((key) => {
              const cellQueries = queriesOf(key);
              return (
                <li key={key} className="rounded border border-basalt-100 p-3">
                  <p className="font-semibold text-basalt-800">
                    <CellHeading cell={cellQueries[0]!} />
                  </p>
                  <CellQueries queries={cellQueries} />
                </li>
              );
            })}
          </ul>
        </>
      )}
    </>
  );
}

function statisticsOf(cell: CellRecord, decimals: ReturnType<typeof figureDecimals>) {
  if (!cell.stats) {
    const why = cell.standing === "excluded" ? "left out of the analysis" : "not in the analysis (lab withdrawn)";
    return [<span key="why" className="text-basalt-700">{why}</span>, "", "", "", ""];
  }
  const { mean, sd, h, k, findings } = cell.stats;
  return [
    formatFigure(mean, decimals.mean),
    formatFigure(sd, decimals.sd),
    formatFigure(h, decimals.ratio),
    formatFigure(k, decimals.ratio),
    findings.length === 0 ? "none" : (
      <strong key="findings" className="text-signal-700">
        <span aria-hidden="true">⚑ </span>
        {findings.map((f) => f.text).join("; ")}
      </strong>
    ),
  ];
}

export function MaterialEvidence({ material, records, responses }: { material: string; records: ResponseRecord[]; responses: ResponseInfo[] }) {
  return (
    <div className="flex flex-col gap-6">
      {records.map((record) => {
        const response = responses.find((r) => r.key === record.response)!;
        const decimals = figureDecimals(response.decimals);
        const { criteria } = record;
        return (
          <section key={record.response} aria-labelledby={`evidence-${record.response}`}>
            <h3 id={`evidence-${record.response}`} className="mb-1 font-semibold text-basalt-800">
              <span className="keep-whole">{material}</span> · {response.name}
              {response.unit && <span className="font-normal text-basalt-700"> ({response.unit})</span>}
            </h3>
            <p className="mb-2 text-sm text-basalt-700">
              {criteria === null
                ? "No submitted results."
                : criteria.hCritical !== null && criteria.kCritical !== null
                  ? `${criteria.p} labs in the analysis. A lab is flagged when |h| > ${formatFigure(criteria.hCritical, 2)} or k > ${formatFigure(criteria.kCritical, 2)}.`
                  : `Cell statistics only: ${criteria.notComputed.join("; ")}`}
            </p>
            <SimpleTable
              caption={`Cells of ${material}, ${response.name}, by lab code`}
              headers={["Lab", "Replicate results", "Cell average", "s", "h", "k", "Findings", "Decision"]}
              rows={record.cells.map((cell) => [
                <span key="lab" className="keep-whole font-semibold">{cell.lab}</span>,
                cell.values.map((v) => formatFigure(v.value, response.decimals)).join(", "),
                ...statisticsOf(cell, decimals),
                // The reason is in the list of decisions above, where it reads as a paragraph.
                cell.decision ? <StateBadge key="decision" view={CELL_DECISION[cell.decision.decision]} /> : "—",
              ])}
            />
          </section>
        );
      })}
    </div>
  );
}
