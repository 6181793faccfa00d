import { execFileSync, spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { studies } from "~/db/schema";
import type { ComputedGroup, StudyAnalysis } from "~/lib/precision";
import { buildStatementBundle } from "~/models/bundle.server";
import * as bundleZip from "~/routes/api/v1/study-bundle";
import * as bundleSummary from "~/routes/api/v1/study-bundle-summary";
import { PUBLISHED_STUDY_CODE } from "../../seed/toolkit-demo";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";

const root = new URL("../..", import.meta.url).pathname;
const workDir = mkdtempSync(join(tmpdir(), "statement-bundle-"));
afterAll(() => rmSync(workDir, { recursive: true, force: true }));

let studyId: number;
let zipBytes: Buffer;

function runCli(args: string[]): Promise<{ status: number | null; stdout: string; stderr: string }> {
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

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = (await db.query.studies.findFirst({ where: eq(studies.code, PUBLISHED_STUDY_CODE) }))!.id;
  const response = await bundleZip.loader({ request: get(`/api/v1/studies/${studyId}/bundle.zip`, await demoCookie("coordinator@ringbatch.example")), params: { studyId: String(studyId) } } as never);
  expect(response.status).toBe(200);
  zipBytes = Buffer.from(await response.arrayBuffer());
  writeFileSync(join(workDir, "bundle.zip"), zipBytes);
  // Unpacked with Debian's unzip, not with our own code.
  execFileSync("unzip", ["-q", join(workDir, "bundle.zip"), "-d", join(workDir, "bundle")]);
});

const bundleFile = (name: string) => readFileSync(join(workDir, "bundle", name), "utf8");

describe("the bundle of a published statement", () => {
  it("holds the README, results, decisions, design, figures, statement text and their SHA-256 sums", () => {
    const names = execFileSync("unzip", ["-Z1", join(workDir, "bundle.zip")], { encoding: "utf8" }).trim().split("\n");
    expect(names).toEqual(["README.md", "results.csv", "decisions.csv", "design.json", "figures.json", "statement.txt", "SHA256SUMS"]);
    // coreutils sha256sum checks every listed file
    expect(execFileSync("sha256sum", ["-c", "SHA256SUMS"], { cwd: join(workDir, "bundle"), encoding: "utf8" })).toMatch(/README.md: OK[\s\S]*statement.txt: OK/);
    expect(bundleFile("results.csv").split("\n")[0]).toBe("lab,material,response,replicate,value");
    expect(bundleFile("results.csv")).not.toMatch(/Quarrow|Tessel|Ostrade/); // lab names never leave, only codes
    expect(bundleFile("decisions.csv")).toContain("excluded");
    expect(bundleFile("README.md")).toContain(JSON.parse(bundleFile("design.json")).recompute);
  });

  it("is the same zip, byte for byte, every time it is built, and the summary shows its SHA-256", async () => {
    const study = (await db.query.studies.findFirst({ where: eq(studies.id, studyId) }))!;
    const again = await buildStatementBundle(study);
    expect(again.zip.equals(zipBytes)).toBe(true);
    const summary = await call(bundleSummary.loader, get(`/api/v1/studies/${studyId}/bundle`, await demoCookie("reviewer1@ringbatch.example")), { studyId: String(studyId) });
    expect(summary.status).toBe(200);
    expect(summary.data.sha256).toBe(createHash("sha256").update(zipBytes).digest("hex"));
  });

  it("recomputes every published figure from the bundle alone with the command it gives", async () => {
    const design = JSON.parse(bundleFile("design.json"));
    const args = (design.recompute as string).replace(/^npm run -s precision -- /, "").replaceAll("bundle/", `${join(workDir, "bundle")}/`).split(" ");
    const run = await runCli(args);
    expect(run.stderr).toBe("");
    expect(run.status).toBe(0);
    const recomputed: StudyAnalysis = JSON.parse(run.stdout);
    const published: StudyAnalysis = JSON.parse(bundleFile("figures.json"));
    expect(recomputed).toEqual(published);
    expect(published.excluded).toHaveLength(1);
    expect(published.groups.filter((g) => g.status === "computed")).toHaveLength(6);
  });

  it("gives s_r, s_R, r and R that the E691 formulas give by hand from results.csv and decisions.csv", () => {
    // ASTM E691: s_r = √(Σs²/p), s_x̄ the SD of cell averages, s_L² = s_x̄² − s_r²/n (≥ 0), s_R = max(√(s_L² + s_r²), s_r), r = 2.8 s_r, R = 2.8 s_R.
    const rows = Papa.parse<Record<string, string>>(bundleFile("results.csv").trim(), { header: true }).data;
    const excluded = Papa.parse<Record<string, string>>(bundleFile("decisions.csv").trim(), { header: true }).data.filter((d) => d.decision === "excluded");
    const published: StudyAnalysis = JSON.parse(bundleFile("figures.json"));
    const sd = (xs: number[]) => {
      const m = xs.reduce((a, b) => a + b, 0) / xs.length;
      return Math.sqrt(xs.reduce((a, x) => a + (x - m) ** 2, 0) / (xs.length - 1));
    };
    for (const group of published.groups.filter((g): g is ComputedGroup => g.status === "computed")) {
      const cellsByLab = new Map<string, number[]>();
      for (const r of rows) {
        if (r.material !== group.material || r.response !== group.response) continue;
        if (excluded.some((e) => e.lab === r.lab && e.material === r.material && e.response === r.response)) continue;
        cellsByLab.set(r.lab!, [...(cellsByLab.get(r.lab!) ?? []), Number(r.value)]);
      }
      const cellValues = [...cellsByLab.values()];
      const n = cellValues[0]!.length;
      const sr = Math.sqrt(cellValues.reduce((a, v) => a + sd(v) ** 2, 0) / cellValues.length);
      const sx = sd(cellValues.map((v) => v.reduce((a, b) => a + b, 0) / v.length));
      const sR = Math.max(Math.sqrt(Math.max(0, sx ** 2 - sr ** 2 / n) + sr ** 2), sr);
      expect(group.p).toBe(cellValues.length);
      expect(group.sr).toBeCloseTo(sr, 10);
      expect(group.sR).toBeCloseTo(sR, 10);
      expect(group.r).toBeCloseTo(2.8 * sr, 10);
      expect(group.R).toBeCloseTo(2.8 * sR, 10);
    }
  });

  it("is not given to analysts, nor made for a study that is not published", async () => {
    const params = { studyId: String(studyId) };
    expect((await call(bundleZip.loader, get(`/api/v1/studies/${studyId}/bundle.zip`, await demoCookie("analyst1@ringbatch.example")), params)).status).toBe(404);
    const checking = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id;
    const refused = await call(bundleSummary.loader, get(`/api/v1/studies/${checking}/bundle`, await demoCookie("coordinator@ringbatch.example")), { studyId: String(checking) });
    expect(refused.status).toBe(404);
    expect(refused.data.error.message).toContain("published");
  });
});
