/**
 * The plain-words README of a statement's bundle: what each file holds, how
 * each published figure is computed, and the command that recomputes them.
 */
import type { StatementSnapshot } from "~/lib/statement-text";

/** The snapshot's study and freezing date, and what the bundle adds to them. */
export type BundleReadmeInput = Pick<StatementSnapshot, "study" | "frozenAt"> & {
  statementVersion: number;
  alpha: number;
  command: string;
  files: { name: string; about: string }[];
};

export function bundleReadme(input: BundleReadmeInput): string {
  const files = input.files.map((f) => `- \`${f.name}\`: ${f.about}`).join("\n");
  return `# ${input.study.code} — recomputable precision statement

${input.study.title}. Test method: ${input.study.testMethod}.
Precision statement version ${input.statementVersion}, frozen ${input.frozenAt}.

Everything needed to check the published figures without trusting the server
that made them: the results (labs by blind code only), the coordinator's
decision on each questioned cell with its reason, the study design and the
settings of the calculation, and the figures as published.

## Files

${files}

\`SHA256SUMS\` lists the SHA-256 of every other file; check them with
\`sha256sum -c SHA256SUMS\`. The statement page shows the SHA-256 of this
whole zip file.

## Recompute

From a checkout of Ringbatch (Node.js 20 or later, \`npm ci\` once), with this
bundle unpacked in \`bundle/\`:

    ${input.command}

It prints the analysis as JSON; its \`groups\`, \`labs\`, \`excluded\` and
\`levelFits\` match \`figures.json\`.

## How each figure is computed

For each material and response (ASTM E691 and ISO 5725-2):

1. Cells excluded in \`decisions.csv\` are left out; retained cells stay.
2. Each lab's cell average x̄ and cell standard deviation s (divisor n − 1).
3. The average of the cell averages x̿ and their standard deviation s_x̄.
4. Repeatability standard deviation s_r = √(Σ s² / p), p the number of labs.
5. Between-lab variance s_L² = s_x̄² − s_r² / n (taken as 0 when negative),
   n the replicates per cell.
6. Reproducibility standard deviation s_R = √(s_L² + s_r²), never below s_r.
7. The 95 % limits r = 2.8·s_r and R = 2.8·s_R; the ASTM C670 forms 1s = s
   and d2s = 2√2·s, and their percent forms with the coefficient of variation.
8. Consistency statistics h = d / s_x̄ (d the deviation of a cell average from
   x̿) and k = s / s_r, against critical values at significance level
   ${input.alpha}; Cochran's and Grubbs' tests at 5 % and 1 % (ISO 5725-2).
9. Per response, s_r and s_R against the level x̿ across the materials:
   s = b·m, s = a + b·m and log s = c + d·log m by least squares, the one with
   the smallest residual standard deviation chosen.

With unequal replicates the ISO 5725-2 general formulas are used (n̄ in
place of n); \`figures.json\` notes where that happened.

These figures support, and do not replace, the procedures of the standards
body and the judgement of licensed engineers; local codes and specifications
govern acceptance of concrete.
`;
}
