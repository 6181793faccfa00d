// Precision statistics of a long-form results CSV, as JSON on standard output.
//
//   npm run -s precision -- FILE.csv [--alpha 0.005|0.01|0.05] [--count RESPONSE]... [--decisions DECISIONS.csv]
//
// --count marks a response as a count (whole numbers ≥ 0); repeat it for several.
// --decisions applies cell decisions (columns lab, material, response, decision,
// reason, as in a statement's bundle): the excluded cells are left out.
// Exit status 1, with one message per line on standard error and nothing on
// standard output, when the input itself is damaged: the file cannot be read,
// a column is missing or doubled, a row is malformed, or a row's data are bad
// (missing name, non-finite value, invalid count, bad or duplicate replicate).
// Sound data that are too thin for a group (fewer than 3 labs, a lab with one
// result) still give exit status 0: that group is printed with its cell
// statistics and `reasons`, and the same messages are listed under `problems`.
import { readFileSync } from "node:fs";
import { parseArgs } from "node:util";
import {
  analyzeStudy,
  isInputError,
  isSignificanceLevel,
  parseResultsCsv,
  SIGNIFICANCE_LEVELS,
  type ExcludedCell,
  type ResponseKind,
} from "../app/lib/precision/index";
import { parseDecisionsCsv } from "../app/lib/bundle/decisions-csv";

const USAGE = "usage: npm run -s precision -- FILE.csv [--alpha 0.005|0.01|0.05] [--count RESPONSE]... [--decisions DECISIONS.csv]";

function fail(messages: readonly string[]): void {
  process.stderr.write(messages.map((message) => `${message}\n`).join(""));
  process.exitCode = 1;
}

function main(argv: string[]): void {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: { alpha: { type: "string" }, count: { type: "string", multiple: true }, decisions: { type: "string" } },
    });
  } catch (error) {
    return fail([(error as Error).message, USAGE]);
  }
  const { values, positionals } = parsed;
  if (positionals.length !== 1) return fail([USAGE]);
  const alpha = values.alpha === undefined ? 0.005 : Number(values.alpha);
  if (!isSignificanceLevel(alpha)) {
    return fail([`--alpha must be one of ${SIGNIFICANCE_LEVELS.join(", ")}, got ${values.alpha}`]);
  }

  const file = positionals[0];
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (error) {
    return fail([`cannot read ${file}: ${(error as Error).message}`]);
  }
  const csv = parseResultsCsv(text);
  if (csv.problems.length > 0) return fail(csv.problems.map((problem) => `${file}: ${problem.message}`));

  const responseKinds: Record<string, ResponseKind> = {};
  for (const response of values.count ?? []) responseKinds[response] = "count";
  let excludedCells: ExcludedCell[] = [];
  if (values.decisions !== undefined) {
    let decisionsText: string;
    try {
      decisionsText = readFileSync(values.decisions, "utf8");
    } catch (error) {
      return fail([`cannot read ${values.decisions}: ${(error as Error).message}`]);
    }
    const decisions = parseDecisionsCsv(decisionsText);
    if (decisions.problems.length > 0) return fail(decisions.problems.map((problem) => `${values.decisions}: ${problem}`));
    excludedCells = decisions.excludedCells;
  }
  const analysis = analyzeStudy(csv.rows, { alpha, responseKinds, excludedCells });
  const inputErrors = analysis.problems.filter(isInputError);
  if (inputErrors.length > 0) return fail(inputErrors.map((problem) => `${file}: ${problem.message}`));
  process.stdout.write(`${JSON.stringify(analysis, null, 2)}\n`);
}

main(process.argv.slice(2));
