import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { analyzeStudy, parseResultsCsv } from "~/lib/precision";
import { runPrecisionCli, scratchDir } from "./support/precision-cli";

const workDir = scratchDir("precision-cli-decisions-");

function write(name: string, text: string) {
  const path = join(workDir, name);
  writeFileSync(path, text);
  return path;
}

// Invented: 4 labs × 2 replicates; L4 is far off.
const RESULTS = ["lab,material,response,replicate,value", ...["L1,10,11", "L2,11,11", "L3,10,10", "L4,15,17"].flatMap((line) => {
  const [lab, a, b] = line.split(",");
  return [`${lab},M1,passes,1,${a}`, `${lab},M1,passes,2,${b}`];
})].join("\n");

describe("precision command --decisions", () => {
  it("leaves out the excluded cells, as the engine does with the same exclusions", async () => {
    const results = write("results.csv", `${RESULTS}\n`);
    const decisions = write("decisions.csv", "lab,material,response,decision,reason\nL4,M1,passes,excluded,Lab confirmed a wrong float\nL2,M1,passes,retained,Lab confirmed the counts\n");
    const run = await runPrecisionCli(results, "--count", "passes", "--decisions", decisions);
    // The command line writes the design warnings (here fewer than 6 labs) to standard error,
    // one "warning: " line each, and nothing else.
    expect(run.stderr.split("\n").filter(Boolean).every((line) => line.startsWith("warning: "))).toBe(true);
    const expected = analyzeStudy(parseResultsCsv(RESULTS).rows, { responseKinds: { passes: "count" }, excludedCells: [{ lab: "L4", material: "M1", response: "passes", reason: "Lab confirmed a wrong float" }] });
    expect(JSON.parse(run.stdout)).toEqual(JSON.parse(JSON.stringify(expected)));
    expect(JSON.parse(run.stdout).groups[0].p).toBe(3);
  });

  it("stops with exit status 1 and the row of a bad decision, printing nothing", async () => {
    const results = write("results2.csv", `${RESULTS}\n`);
    const decisions = write("bad-decisions.csv", "lab,material,response,decision,reason\nL4,M1,passes,dropped,because\n");
    const run = await runPrecisionCli(results, "--decisions", decisions);
    expect(run.status).toBe(1);
    expect(run.stdout).toBe("");
    expect(run.stderr).toBe(`${decisions}: row 2: decision must be "excluded" or "retained", got "dropped"\n`);
  });
});
