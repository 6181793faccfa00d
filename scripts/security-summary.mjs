// Adds up the figures the security suites recorded and prints them on one line.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

/** Tests of the outside review's twelve findings (tests/security/review-findings*.test.ts); each counts only when it passed. */
const FINDING_TESTS = 28;

const dir = join("tests", ".tmp", "security-figures");
const totals = { routesTimesRoles: 0, badInputs: 0, rowsLost: 0, findingsChecked: 0 };
if (existsSync(dir)) {
  for (const file of readdirSync(dir)) {
    const { name, value } = JSON.parse(readFileSync(join(dir, file), "utf8"));
    totals[name] += value;
  }
}
console.log(
  `security summary: routes × roles checked: ${totals.routesTimesRoles}, bad inputs tried: ${totals.badInputs}, rows lost: ${totals.rowsLost}, review findings checked: ${totals.findingsChecked} of ${FINDING_TESTS}`,
);
process.exitCode =
  totals.rowsLost === 0 && totals.routesTimesRoles > 0 && totals.badInputs >= 1000 && totals.findingsChecked === FINDING_TESTS ? 0 : 1;
