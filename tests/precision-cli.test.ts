import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { repoRoot, runPrecisionCli, scratchDir } from "./support/precision-cli";

const workDir = scratchDir("precision-cli-");

const HEADER = "lab,material,response,replicate,value";

function writeCsv(name: string, lines: string[]): string {
  const path = join(workDir, name);
  writeFileSync(path, `${lines.join("\n")}\n`);
  return path;
}

// NIST StRD one-way ANOVA "SiRstv" in long form, instruments read as labs (tests/fixtures).
const nist = Papa.parse<{ instrument: string; resistance: string }>(
  readFileSync(join(repoRoot, "tests/fixtures/nist-strd-anova-SiRstv.csv"), "utf8").trim(),
  { header: true },
).data;
const nistLines = nist.map((record, i) => `I${record.instrument},SiR,resistivity,${(i % 5) + 1},${record.resistance}`);

// Invented small study: 3 labs × 2 replicates, a second response with only 2 labs.
const smallLines = [
  HEADER,
  "L01,M1,slump,1,100",
  "L01,M1,slump,2,102",
  "L02,M1,slump,1,101",
  "L02,M1,slump,2,104",
  "L03,M1,slump,1,98",
  "L03,M1,slump,2,99",
  "L01,M1,air,1,5.5",
  "L01,M1,air,2,5.7",
  "L02,M1,air,1,5.2",
  "L02,M1,air,2,5.4",
];

describe("npm run precision", () => {
  it("prints the precision statistics of a small file as JSON", async () => {
    const { status, stdout, stderr } = await runPrecisionCli(writeCsv("small.csv", smallLines));
    // The practices' minimum design is checked; 3 labs and 1 material fall short, and the
    // command line says so on standard error (it used to print nothing there) while still exiting 0.
    expect(stderr.trim().split("\n").every((line) => line.startsWith("warning: "))).toBe(true);
    expect(stderr).toMatch(/fewer than 6 labs: M1 \/ slump \(3\), M1 \/ air \(2\)/);
    expect(status).toBe(0);
    const output = JSON.parse(stdout);
    const slump = output.groups[0];
    expect(slump).toMatchObject({ material: "M1", response: "slump", status: "computed", p: 3, n: 2 });
    for (const key of ["mean", "sx", "sr", "sL", "sR", "r", "R", "hCritical", "kCritical"]) {
      expect(typeof slump[key]).toBe("number");
    }
    expect(Object.keys(slump.labs[0])).toEqual(expect.arrayContaining(["lab", "n", "mean", "sd", "d", "h", "k", "flags"]));
    // By hand: cell variances 2, 4.5, 0.5 → s_r² = 7/3.
    expect(slump.sr).toBeCloseTo(Math.sqrt(7 / 3), 14);
    // Sound data but too few labs: printed with its reason, not fatal.
    expect(output.groups[1]).toMatchObject({ response: "air", status: "not-computed", p: 2 });
    expect(output.groups[1].reasons[0]).toMatch(/at least 3 labs/);
    expect(output.problems).toMatchObject([{ code: "too-few-labs" }]);
    // The new figures: confidence intervals, A_r / A_R, the screening steps, findings, warnings, the C670 form.
    expect(slump.uncertainty.sr).toMatchObject({ df: 3, method: expect.stringMatching(/chi-square/) });
    expect(slump.uncertainty.sR.method).toMatch(/Satterthwaite|s_L² < 0/);
    expect(typeof slump.uncertainty.Ar).toBe("number");
    expect(slump.screening.map((step: { test: string }) => step.test)).toEqual(["cochran", "grubbs-single", "grubbs-single", "grubbs-double", "grubbs-double"]);
    expect(slump.labs[0].findings).toEqual([]);
    expect(output.warnings.map((w: { code: string }) => w.code)).toEqual(["few-labs", "few-materials", "few-materials"]);
    expect(output.significance).toMatch(/ASTM E691's 0.5 % level/);
    expect(output.levelFits[0].c670Form.form).toBe("absolute");
  });

  it("refuses a value whose square would overflow and names its row", async () => {
    // Results files take plain decimals only (no exponent), so 1e200 is written out in full.
    const lines = [...smallLines.slice(0, 3), `L02,M1,slump,1,1${"0".repeat(200)}`, ...smallLines.slice(4, 7)];
    const { status, stdout, stderr } = await runPrecisionCli(writeCsv("huge.csv", lines));
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toMatch(/row 4 .*too large to compute with: its square would overflow/);
  });

  it("reproduces NIST StRD SiRstv's certified within mean square, in full double precision", async () => {
    const { status, stdout } = await runPrecisionCli(writeCsv("nist.csv", [HEADER, ...nistLines]));
    expect(status).toBe(0);
    const group = JSON.parse(stdout).groups[0];
    // NIST StRD certified residual standard deviation for SiRstv: 1.04076068334656E-01.
    expect(Math.abs(group.sr / 1.04076068334656e-1 - 1)).toBeLessThan(1e-12);
  });

  it("--alpha 0.05 switches h to the ISO 5725-2 5 % critical value", async () => {
    const { status, stdout } = await runPrecisionCli(writeCsv("nist-alpha.csv", [HEADER, ...nistLines]), "--alpha", "0.05");
    expect(status).toBe(0);
    // ISO 5725-2 h table at 5 %, from memory: p = 5 → 1.57.
    expect(Math.abs(JSON.parse(stdout).groups[0].hCritical - 1.57)).toBeLessThanOrEqual(0.006);
  });

  it("refuses an unsupported --alpha", async () => {
    const { status, stdout, stderr } = await runPrecisionCli(writeCsv("alpha.csv", smallLines), "--alpha", "0.1");
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toMatch(/--alpha must be one of 0.005, 0.01, 0.05/);
  });

  it("fails on a file it cannot read", async () => {
    const { status, stdout, stderr } = await runPrecisionCli(join(workDir, "does-not-exist.csv"));
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toMatch(/cannot read .*does-not-exist\.csv/);
  });

  it("fails without a file argument", async () => {
    const { status, stderr } = await runPrecisionCli();
    expect(status).toBe(1);
    expect(stderr).toMatch(/usage/);
  });

  it("fails on a missing column", async () => {
    const { status, stdout, stderr } = await runPrecisionCli(writeCsv("columns.csv", ["lab,material,response,value", "L01,M1,slump,3"]));
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toMatch(/no "replicate" column/);
  });

  it("fails on a non-finite value and names its row", async () => {
    const lines = [...smallLines];
    lines[3] = "L02,M1,slump,1,n/a";
    const { status, stdout, stderr } = await runPrecisionCli(writeCsv("nonfinite.csv", lines));
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toMatch(/row 4 \(lab L02, material M1, response slump, replicate 1\): the value is not a finite number/);
  });

  it("fails on duplicate replicate numbers and names both rows", async () => {
    const lines = [...smallLines];
    lines[2] = "L01,M1,slump,1,102";
    const { status, stderr } = await runPrecisionCli(writeCsv("duplicate.csv", lines));
    expect(status).toBe(1);
    expect(stderr).toMatch(/row 3 .*replicate 1 appears twice in this cell; first at row 2/);
  });

  it("fails on a negative or fractional value of a --count response", async () => {
    const lines = [HEADER, "L01,M1,passes,1,3", "L01,M1,passes,2,-1", "L02,M1,passes,1,2.5", "L02,M1,passes,2,2", "L03,M1,passes,1,4", "L03,M1,passes,2,4"];
    const path = writeCsv("count.csv", lines);
    const { status, stderr } = await runPrecisionCli(path, "--count", "passes");
    expect(status).toBe(1);
    expect(stderr).toMatch(/row 3 .*negative, but passes is a count/);
    expect(stderr).toMatch(/row 4 .*not a whole number, but passes is a count/);
    // Without --count the same file is continuous data and fine.
    expect((await runPrecisionCli(path)).status).toBe(0);
  });

  it("fails on a malformed row", async () => {
    const { status, stderr } = await runPrecisionCli(writeCsv("malformed.csv", [HEADER, "L01,M1,slump,1"]));
    expect(status).toBe(1);
    expect(stderr).toMatch(/row 2: 4 fields where the header has 5/);
  });

  it("prints a group with a one-result lab, with the reason", async () => {
    const { status, stdout } = await runPrecisionCli(writeCsv("single.csv", smallLines.slice(0, 6)));
    expect(status).toBe(0);
    const group = JSON.parse(stdout).groups[0];
    expect(group.status).toBe("not-computed");
    expect(group.reasons).toEqual([expect.stringMatching(/lab L03 has 1 result/)]);
    expect(group.labs).toHaveLength(3);
  });
});
