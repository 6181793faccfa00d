// Benchmark of the precision engine: 1,000 labs × 50 materials × 2 responses × 10
// replicates (1,000,000 results) through analyzeStudy, against one plain pass that
// sums the same values. Prints what it measured; it asserts nothing.
import { pathToFileURL } from "node:url";
import { analyzeStudy, type ResultRow } from "../app/lib/precision/index";
import { seededUniform } from "../app/lib/precision/seeded-uniform";

const LABS = 1_000;
const MATERIALS = 50;
const RESPONSES = ["strength", "slump"];
const REPLICATES = 10;
const RUNS = 5;

function generateRows(): ResultRow[] {
  const uniform = seededUniform(42);
  const noise = () => uniform() + uniform() + uniform() - 1.5;
  const labs = Array.from({ length: LABS }, (_, i) => `L${String(i + 1).padStart(4, "0")}`);
  const materials = Array.from({ length: MATERIALS }, (_, i) => `M${i + 1}`);
  const rows: ResultRow[] = [];
  // File order as labs report: lab by lab, then material, response and replicate.
  for (const lab of labs) {
    for (let m = 0; m < MATERIALS; m++) {
      for (const response of RESPONSES) {
        const level = (m + 1) * (response === "slump" ? 2 : 10);
        const bias = 0.02 * level * noise();
        for (let replicate = 1; replicate <= REPLICATES; replicate++) {
          const value = level + bias + 0.01 * level * noise();
          rows.push({ lab, material: materials[m], response, replicate, value, row: rows.length + 2 });
        }
      }
    }
  }
  return rows;
}

function shuffled<T>(items: readonly T[]): T[] {
  const uniform = seededUniform(7);
  const copy = [...items];
  for (let i = copy.length - 1; i > 0; i--) {
    const j = Math.floor(uniform() * (i + 1));
    [copy[i], copy[j]] = [copy[j], copy[i]];
  }
  return copy;
}

function time<T>(run: () => T): { ms: number; result: T } {
  const start = performance.now();
  const result = run();
  return { ms: performance.now() - start, result };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

function sumValues(rows: readonly ResultRow[]): number {
  let total = 0;
  for (let i = 0; i < rows.length; i++) total += rows[i].value;
  return total;
}

/** Runs the engine benchmark, printing each figure; returns the medians for callers such as `npm run bench`. */
export function benchPrecisionEngine() {
  const rows = generateRows();
  const fmt = (ms: number) => `${ms.toFixed(1)} ms`;
  console.log(`results: ${rows.length.toLocaleString("en")} (${LABS} labs × ${MATERIALS} materials × ${RESPONSES.length} responses × ${REPLICATES} replicates)`);
  console.log(`node ${process.version}, ${RUNS} timed runs each after the first (cold) one; medians shown`);

  const sumRuns = Array.from({ length: RUNS + 1 }, () => time(() => sumValues(rows)));
  const sumMs = median(sumRuns.slice(1).map((run) => run.ms));
  console.log(`summing pass:        cold ${fmt(sumRuns[0].ms)}, median ${fmt(sumMs)} (total ${sumRuns[0].result.toFixed(3)})`);

  const cold = time(() => analyzeStudy(rows));
  const warm = Array.from({ length: RUNS }, () => time(() => analyzeStudy(rows)).ms);
  const analysisMs = median(warm);
  const groups = cold.result.groups;
  const computed = groups.filter((group) => group.status === "computed").length;
  console.log(
    `analyzeStudy:        cold ${fmt(cold.ms)} (includes JIT warm-up and computing the critical values), median ${fmt(analysisMs)}`,
  );
  console.log(`                     ${groups.length} groups, ${computed} computed, ${cold.result.problems.length} problems`);

  // The same rows shuffled: every row starts a new cell, and memory is read out of order.
  const mixed = shuffled(rows);
  const mixedSumMs = median(Array.from({ length: RUNS }, () => time(() => sumValues(mixed)).ms));
  const mixedMs = median(Array.from({ length: RUNS }, () => time(() => analyzeStudy(mixed)).ms));
  console.log(`rows in random order: summing pass median ${fmt(mixedSumMs)}, analyzeStudy median ${fmt(mixedMs)}`);

  const ratio = analysisMs / sumMs;
  console.log(`ratio analysis / summing pass (medians): file order ${ratio.toFixed(1)} ×; random order ${(mixedMs / mixedSumMs).toFixed(1)} ×`);
  const goalMet = analysisMs < 1000 && ratio < 20;
  console.log(`goal (under 1 s and under 20 × the summing pass, file order, medians): ${goalMet ? "met" : "NOT met"}`);
  return { analysisMs, sumMs, ratio, goalMet };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) benchPrecisionEngine();
