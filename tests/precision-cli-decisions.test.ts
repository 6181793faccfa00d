import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeStudy, parseResultsCsv } from "~/lib/precision";

const root = new URL("..", import.meta.url).pathname;
const workDir = mkdtempSync(join(tmpdir(), "precision-cli-decisions-"));
afterAll(() => rmSync(workDir, { recursive: true, force: true }));

function write(name: string, text: string) {
  const path = join(workDir, name);
  writeFileSync(path, text);
  return path;
}

function runCli(...args: string[]): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn("npx", ["tsx", "scripts/precision.ts", ...args], { cwd: root });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (chunk) => (stdout += chunk));
    child.stderr.on("data", (chunk) => (stderr += chunk));
    child.on("error", reject);
    child.on("close", (status) => resolve({ status, stdout, stderr }));
  });
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
    const run = await runCli(results, "--count", "passes", "--decisions", decisions);
    expect(run.stderr).toBe("");
    const expected = analyzeStudy(parseResultsCsv(RESULTS).rows, { responseKinds: { passes: "count" }, excludedCells: [{ lab: "L4", material: "M1", response: "passes", reason: "Lab confirmed a wrong float" }] });
    expect(JSON.parse(run.stdout)).toEqual(JSON.parse(JSON.stringify(expected)));
    expect(JSON.parse(run.stdout).groups[0].p).toBe(3);
  });

  it("stops with exit status 1 and the row of a bad decision, printing nothing", async () => {
    const results = write("results2.csv", `${RESULTS}\n`);
    const decisions = write("bad-decisions.csv", "lab,material,response,decision,reason\nL4,M1,passes,dropped,because\n");
    const run = await runCli(results, "--decisions", decisions);
    expect(run.status).toBe(1);
    expect(run.stdout).toBe("");
    expect(run.stderr).toBe(`${decisions}: row 2: decision must be "excluded" or "retained", got "dropped"\n`);
  });
});
