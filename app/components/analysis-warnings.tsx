/**
 * What the analysis page says about the study design and the screening: the
 * practices' minimums it falls short of, what the significance choice changes,
 * and, per group, the ISO 5725-2 screening steps in order with the tests that
 * were uninformative (ties) or not run, and why.
 */
import { Notice, SimpleTable } from "~/components/ui";
import type { ComputedGroup, ScreeningStep, StudyWarning } from "~/lib/precision";
import { formatFixed } from "~/lib/format";

export function DesignWarnings({ warnings }: { warnings: readonly StudyWarning[] | undefined }) {
  if (!warnings || warnings.length === 0) return null;
  return (
    <Notice tone="caution">
      <strong>Below the practices' minimum design.</strong> The figures are computed, but rest on little:
      <ul className="mt-1 list-disc pl-5">
        {warnings.map((w) => (
          <li key={`${w.code}:${w.response ?? ""}`}>{w.message}.</li>
        ))}
      </ul>
    </Notice>
  );
}

export function SignificanceEffect({ text }: { text: string | undefined }) {
  return text ? <p className="mt-2 text-sm text-basalt-700">{text}</p> : null;
}

const TEST_LABEL: Record<ScreeningStep["test"], string> = {
  cochran: "Cochran (cell spreads)",
  "grubbs-single": "Grubbs, single",
  "grubbs-double": "Grubbs, double (pair)",
};

const OUTCOME_LABEL: Record<ScreeningStep["outcome"], string> = {
  flagged: "flagged",
  passed: "nothing found",
  uninformative: "cannot judge (ties)",
  "not-run": "not run",
};

const fixed = (x: number | null, digits: number) => (x === null ? "—" : formatFixed(x, digits));

/** The ISO 5725-2 §7.3 screening of one group, in the order the practice runs it. */
export function ScreeningSteps({ group }: { group: ComputedGroup }) {
  if (!group.screening) return null;
  return (
    <SimpleTable
      caption={`ISO 5725-2 screening of ${group.material}, ${group.response}, in order`}
      headers={["Test", "Side", "Lab(s)", "Statistic", "5 %", "1 %", "Outcome"]}
      rows={group.screening.map((step) => {
        const digits = step.test === "grubbs-single" ? 3 : 4;
        return [
          TEST_LABEL[step.test],
          step.side ?? "—",
          step.labs.join(" + ") || "—",
          `${step.test === "cochran" ? "C" : "G"} = ${fixed(step.statistic, digits)}`,
          fixed(step.critical5, digits),
          fixed(step.critical1, digits),
          <span key="o">
            {OUTCOME_LABEL[step.outcome]}
            {step.class && ` — ${step.class}`}
            {step.reason && <span className="block text-sm text-basalt-700">{step.reason}</span>}
          </span>,
        ];
      })}
    />
  );
}
