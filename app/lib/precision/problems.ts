import type { Problem, ProblemCode } from "./types";

const GROUP_LEVEL_CODES: ReadonlySet<ProblemCode> = new Set([
  "too-few-labs",
  "too-few-replicates",
  "excluded-cell-not-found",
]);

/**
 * True when the problem lies in the input itself (the file, or a row's data),
 * false when the data are sound but a group has too few of them or an
 * exclusion matched nothing. Callers that must not go on with damaged input
 * (the command line, an import) stop on the first kind.
 */
export function isInputError(problem: Problem): boolean {
  return !GROUP_LEVEL_CODES.has(problem.code);
}
