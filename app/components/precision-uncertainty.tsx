/**
 * How far the precision figures can be trusted, per response: 95 % confidence
 * intervals of σ_r (chi-square) and σ_R (Satterthwaite), ISO 5725-1's ±A_r and
 * ±A_R, the weighted level fit with the reason for its relation, and the C670
 * form the statement uses. Shared by the analysis page and the report.
 */
import { SimpleTable } from "~/components/ui";
import type { ComputedGroup, StudyAnalysis } from "~/lib/precision";
import { formatSignificant } from "~/lib/precision/significant-digits";
import type { ResponseInfo } from "~/components/precision-tables";

const sig = (x: number | null | undefined) => formatSignificant(x, 3);
const pct = (x: number) => `± ${(100 * x).toFixed(0)} %`;

export function PrecisionIntervalsTable({ analysis, response }: { analysis: StudyAnalysis; response: ResponseInfo }) {
  const groups = analysis.groups.filter((g): g is ComputedGroup => g.status === "computed" && g.response === response.key && g.uncertainty !== undefined);
  if (groups.length === 0) return null;
  const unit = response.unit ? ` (${response.unit})` : "";
  return (
    <SimpleTable
      caption={`Confidence intervals of the precision of ${response.name}`}
      headers={["Material", `s_r${unit}`, "95 % interval of σ_r", `s_R${unit}`, "95 % interval of σ_R", "ISO 5725-1 A_r", "A_R (γ)"]}
      rows={groups.map((g) => [
        g.material,
        sig(g.sr),
        <span key="r">
          {sig(g.uncertainty.sr.lower)} to {sig(g.uncertainty.sr.upper)}
          <span className="block text-sm text-basalt-700">{g.uncertainty.sr.method}</span>
        </span>,
        sig(g.sR),
        <span key="R">
          {sig(g.uncertainty.sR.lower)} to {sig(g.uncertainty.sR.upper)}
          <span className="block text-sm text-basalt-700">{g.uncertainty.sR.method}</span>
        </span>,
        pct(g.uncertainty.Ar),
        `${pct(g.uncertainty.AR)} (${g.uncertainty.gamma.toFixed(2)})`,
      ])}
    />
  );
}

export function LevelFitSummary({ analysis, response }: { analysis: StudyAnalysis; response: ResponseInfo }) {
  const fit = analysis.levelFits.find((f) => f.response === response.key);
  if (!fit) return null;
  const line = (label: string, report: typeof fit.sr) =>
    report.chosen ? (
      <li>
        {label}: <strong>{report.candidates.find((c) => c.relation === report.chosen)?.formula}</strong> — {report.reason}
        {report.notes.length > 0 && <span className="text-basalt-700"> ({report.notes.join("; ")})</span>}
      </li>
    ) : (
      <li>
        {label}: no relation fitted{report.notes.length > 0 ? ` — ${report.notes.join("; ")}` : ""}
      </li>
    );
  return (
    <div className="text-sm">
      <p className="font-semibold text-basalt-800">Dependence on level (ISO 5725-2 §7.5, weighted fit)</p>
      <ul className="list-disc pl-5">
        {line("s_r", fit.sr)}
        {line("s_R", fit.sR)}
        {fit.c670Form && (
          <li>
            C670 form of the statement: <strong>{fit.c670Form.form === "percent" ? "1s % and d2s %" : `1s and d2s in ${response.unit || "the response's units"}`}</strong>{" "}
            for both precisions — {fit.c670Form.reason}
          </li>
        )}
      </ul>
    </div>
  );
}

/** Per response: the intervals table and the level fit summary. */
export function PrecisionUncertainty({ analysis, responses }: { analysis: StudyAnalysis; responses: ResponseInfo[] }) {
  return (
    <div className="flex flex-col gap-6">
      <p className="text-sm text-basalt-700">
        σ_r: chi-square with p(n − 1) degrees of freedom. σ_R: Satterthwaite's approximation. A_r and A_R: ISO 5725-1's ±95 % relative uncertainty
        for this many labs and replicates, γ = s_R/s_r. Figures to three significant digits.
      </p>
      {responses.map((response) => (
        <section key={response.key} aria-label={`Uncertainty of ${response.name}`} className="flex flex-col gap-3">
          <h3 className="font-semibold text-basalt-800">{response.name}</h3>
          <PrecisionIntervalsTable analysis={analysis} response={response} />
          <LevelFitSummary analysis={analysis} response={response} />
        </section>
      ))}
    </div>
  );
}
