/**
 * The security suites report what they checked (routes × roles, bad inputs
 * tried, rows lost); `npm run test:security` adds these up in its last line.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";

export const FIGURES_DIR = join("tests", ".tmp", "security-figures");

/** `findingsChecked`: tests of the outside review's findings that passed. */
export type FigureName = "routesTimesRoles" | "badInputs" | "rowsLost" | "findingsChecked";

/** Records one suite's figure (a file per suite and figure, so parallel suites do not collide). */
export function recordFigure(suite: string, name: FigureName, value: number) {
  mkdirSync(FIGURES_DIR, { recursive: true });
  writeFileSync(join(FIGURES_DIR, `${suite}.${name}.json`), JSON.stringify({ suite, name, value }));
}
