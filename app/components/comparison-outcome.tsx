/** A comparison's figures and verdict, shown on the new-comparison page and on the printable sheet alike. */
import { acceptabilityVerdict, comparisonVerdict } from "~/lib/comparison";
import type { ComparisonOutcome } from "~/models/comparison.server";
import { Notice, SimpleTable } from "~/components/ui";
import { formatFixed } from "~/lib/format";

const two = (x: number) => formatFixed(x, 2);

export function ComparisonOutcomeView({ outcome, unit }: { outcome: ComparisonOutcome; unit: string }) {
  const { comparison, reference, trial } = outcome;
  const { precision } = comparison;
  const basis =
    precision.basis === "level-relation"
      ? `from the statement's level relation at the mixtures' level of ${two(precision.level)} ${unit}`
      : `from material ${precision.material}, the one nearest the mixtures' level of ${two(precision.level)} ${unit} (the statement has no level relation)`;
  return (
    <div className="flex flex-col gap-4">
      <Notice tone={comparison.real ? "caution" : "info"}>
        <p data-testid="comparison-verdict">{comparisonVerdict(comparison, unit)}</p>
      </Notice>
      <SimpleTable
        caption="Comparison figures"
        headers={["Figure", "Value"]}
        rows={[
          [`Average of ${comparison.reference.label} (${comparison.reference.n} results)`, `${two(comparison.reference.mean)} ${unit}`],
          [`Average of ${comparison.trial.label} (${comparison.trial.n} results)`, `${two(comparison.trial.mean)} ${unit}`],
          ["Observed difference (trial − reference)", `${two(comparison.difference)} ${unit}`],
          ["σ_r (repeatability standard deviation)", `${two(precision.sr)} ${unit}, ${basis}`],
          ["σ_R (reproducibility standard deviation)", `${two(precision.sR)} ${unit}`],
          [
            comparison.setting === "same-lab" ? "Critical difference at 95 %, within one lab" : "Critical difference at 95 %, between two labs",
            `${two(comparison.criticalDifference)} ${unit} (ISO 5725-6: ${comparison.setting === "same-lab" ? "2.8·σ_r·√(1/(2n₁) + 1/(2n₂))" : "2.8·√(σ_R² − σ_r²·(1 − 1/(2n₁) − 1/(2n₂)))"})`,
          ],
        ]}
      />
      {(reference || trial) && (
        <div>
          <h3 className="mb-1 font-semibold text-basalt-800">Acceptability of the replicates (ISO 5725-6, critical range f(n)·σ_r)</h3>
          <ul className="list-disc pl-6">
            {reference && <li>{`${comparison.reference.label}: ${acceptabilityVerdict(reference, unit)}`}</li>}
            {trial && <li>{`${comparison.trial.label}: ${acceptabilityVerdict(trial, unit)}`}</li>}
          </ul>
        </div>
      )}
    </div>
  );
}
