/**
 * `npm run bench`: builds the app, serves it on a generated large study
 * (40 labs × 12 materials × 2 responses × 5 replicates) beside the demo, and
 * prints one line per figure, each with its goal. It prints what it measured
 * and asserts nothing.
 */
import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import autocannon from "autocannon";
import { and, eq } from "drizzle-orm";
import { closeDatabase, db, migrateDatabase } from "../app/db/client.server";
import { enrollments, labs, materials, studies } from "../app/db/schema";
import { DEMO_LABS, DEMO_PASSWORD } from "../seed/demo-data";
import { seedLargeStudy } from "../seed/large-study";
import { seedDemo } from "../seed/seed";
import { startServer } from "../tests/support/server";
import { benchPrecisionEngine } from "./bench-precision";

const BUILD_DIR = process.env.BUILD_DIR ?? "build-bench";
const line = (figure: string, measured: string, goal: string, met: boolean) =>
  console.log(`${figure.padEnd(46)} ${measured.padEnd(44)} goal ${goal} — ${met ? "met" : "NOT met"}`);
const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
};
const ms = (n: number) => `${n.toFixed(1)} ms`;

console.log(`Ringbatch benchmark — ${new Date().toISOString()} — node ${process.version}`);

// 1. The engine alone, in this process.
console.log("\n1. precision engine on 1,000,000 values");
const engine = benchPrecisionEngine();

// Build and prepare the database.
console.log(`\nbuilding into ${BUILD_DIR}/ …`);
const build = spawnSync("npm", ["run", "-s", "build"], { env: { ...process.env, BUILD_DIR }, encoding: "utf8" });
if (build.status !== 0) throw new Error(`build failed:\n${build.stderr}`);
process.env.DATABASE_URL = `file:${join(mkdtempSync(join(tmpdir(), "ringbatch-bench-")), "bench.db")}`;
await migrateDatabase();
await seedDemo(db);
const large = await seedLargeStudy(db);
const testing = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!;
const [ownEnrollment] = await db
  .select({ id: enrollments.id })
  .from(enrollments)
  .innerJoin(labs, eq(labs.id, enrollments.labId))
  .where(and(eq(enrollments.studyId, testing.id), eq(labs.name, DEMO_LABS[7].name)));
const material = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, testing.id), eq(materials.code, "F2")) }))!;
const databaseUrl = process.env.DATABASE_URL;
closeDatabase();
if (!ownEnrollment) throw new Error("demo enrollment missing");

// The per-caller API limit (600 a minute) would turn most of the load into 429s: lift it for the run.
const server = await startServer({ BUILD_DIR, API_RATE_LIMIT_PER_MINUTE: "100000000" }, { databaseUrl });
try {
  const signIn = async (email: string) => {
    const response = await fetch(`${server.url}/login`, {
      method: "POST",
      redirect: "manual",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: server.url },
      body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
    });
    return response.headers.get("Set-Cookie")!.split(";")[0]!;
  };
  const coordinator = await signIn("coordinator@ringbatch.example");
  const analyst = await signIn("analyst8@ringbatch.example");

  const timeRequests = async (count: number, request: () => Promise<Response>) => {
    const durations: number[] = [];
    for (let i = 0; i < count; i++) {
      const start = performance.now();
      const response = await request();
      await response.arrayBuffer();
      if (!response.ok) throw new Error(`status ${response.status}`);
      durations.push(performance.now() - start);
    }
    return { p50: percentile(durations, 50), p95: percentile(durations, 95) };
  };

  // 2. The analysis page's loader (its data request), on the large study.
  const analysis = await timeRequests(200, () => fetch(`${server.url}/studies/${large.id}/analysis.data`, { headers: { Cookie: coordinator } }));

  // 3. The precision endpoint against a bare node:http server returning the same bytes, each server in its own process.
  const precisionUrl = `${server.url}/api/v1/studies/${large.id}/precision`;
  const body = Buffer.from(await (await fetch(precisionUrl, { headers: { Cookie: coordinator } })).arrayBuffer());
  const bodyFile = join(mkdtempSync(join(tmpdir(), "ringbatch-bench-bare-")), "precision.json");
  writeFileSync(bodyFile, body);
  const bare = spawn(process.execPath, ["scripts/bench-bare-server.mjs", bodyFile], { stdio: ["ignore", "pipe", "inherit"] });
  const barePort = Number(await new Promise<string>((resolve) => bare.stdout!.once("data", (chunk: Buffer) => resolve(chunk.toString().trim()))));
  const load = (url: string, headers: Record<string, string> = {}) =>
    autocannon({ url, connections: 10, duration: 8, headers }) as Promise<autocannon.Result>;
  const appLoad = await load(precisionUrl, { Cookie: coordinator });
  // The same server's lightest route, which goes the whole React Router way: the ceiling of any route read.
  const healthLoad = await load(`${server.url}/healthz`);
  const bareLoad = await load(`http://127.0.0.1:${barePort}/`);
  bare.kill();

  // 4. The result entry's autosave: a draft save through the page's action, as the fetcher sends it.
  const draft = { values: { "holes:1": "9", "holes:2": "10", "surface:1": "15" } as Record<string, string>, testedOn: {}, operator: {}, fresh: {}, batchedAt: "" };
  let flip = 0;
  const autosave = await timeRequests(200, () => {
    draft.values["holes:3"] = String(8 + (flip++ % 2));
    return fetch(`${server.url}/lab/studies/${testing.id}/results/${material.id}.data`, {
      method: "POST",
      headers: { Cookie: analyst, Origin: server.url, "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ intent: "draft", draft: JSON.stringify(draft) }),
    });
  });

  console.log("\nfigures");
  line("1. engine / summing pass (1,000,000 values)", `${ms(engine.analysisMs)} / ${ms(engine.sumMs)} = ${engine.ratio.toFixed(1)} ×`, "≤ 20 ×", engine.ratio <= 20);
  line("2. analysis page loader, 200 requests", `p50 ${ms(analysis.p50)}, p95 ${ms(analysis.p95)}`, "p95 ≤ 50 ms", analysis.p95 <= 50);
  const ratio = appLoad.requests.average / bareLoad.requests.average;
  const refused = appLoad.non2xx + appLoad.errors + appLoad.timeouts;
  line(
    "3. GET …/precision throughput (autocannon)",
    `${appLoad.requests.average.toFixed(0)} vs bare ${bareLoad.requests.average.toFixed(0)} req/s = ${ratio.toFixed(2)}`,
    "≥ 0.5, all 200",
    ratio >= 0.5 && refused === 0,
  );
  console.log(`   ${appLoad["2xx"]} answers 200, ${refused} not (non-2xx, errors, timeouts)`);
  console.log(`   for scale: GET /healthz on the same server ${healthLoad.requests.average.toFixed(0)} req/s (one trivial query through React Router: the ceiling of any route read)`);
  line("4. result entry autosave round trip, 200", `p50 ${ms(autosave.p50)}, p95 ${ms(autosave.p95)}`, "p95 ≤ 50 ms", autosave.p95 <= 50);
  for (const page of javascriptPerPage()) {
    const goal = page.route.includes("results.$materialId") ? "≤ 150 kB" : "";
    const met = goal ? page.gzipBytes <= 150 * 1024 : true;
    if (goal || page.charts) line(`5. JS for ${page.route}`, `${(page.gzipBytes / 1024).toFixed(1)} kB gzip${page.charts ? ", with charts" : ""}`, goal || "charts only here", met);
  }
  const chartsElsewhere = javascriptPerPage().filter((p) => p.charts && !/analysis|review|report/.test(p.route));
  line("5. charting library on pages without charts", chartsElsewhere.map((p) => p.route).join(", ") || "none", "none", chartsElsewhere.length === 0);
} finally {
  await server.stop();
}

/**
 * Gzipped JavaScript each route loads up front (entry, root, route module and
 * their imports), from the build's route manifest, and whether the page can
 * load the charting library (statically, or through a lazy import of its chunk).
 */
function javascriptPerPage() {
  const assets = join(BUILD_DIR, "client");
  const manifestFile = readdirSync(join(assets, "assets")).find((f) => /^manifest-.*\.js$/.test(f))!;
  const text = readFileSync(join(assets, "assets", manifestFile), "utf8");
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as {
    entry: { module: string; imports: string[] };
    routes: Record<string, { module: string; imports?: string[] }>;
  };
  const content = (file: string) => readFileSync(join(assets, file));
  // echarts' renderer library is bundled into the chart chunk; no other code carries its name.
  const chartChunks = readdirSync(join(assets, "assets"))
    .filter((f) => f.endsWith(".js") && content(`assets/${f}`).includes("zrender"))
    .map((f) => `assets/${f}`);
  const lazyChartLoaders = readdirSync(join(assets, "assets"))
    .filter((f) => f.endsWith(".js") && chartChunks.some((chunk) => content(`assets/${f}`).includes(chunk.slice("assets/".length))))
    .map((f) => f);
  const root = manifest.routes.root!;
  return Object.entries(manifest.routes)
    .filter(([id]) => id !== "root")
    .map(([id, route]) => {
      const files = [...new Set([manifest.entry.module, ...manifest.entry.imports, root.module, ...(root.imports ?? []), route.module, ...(route.imports ?? [])])];
      const gzipBytes = files.reduce((sum, file) => sum + gzipSync(content(file.replace(/^\//, ""))).length, 0);
      const charts = files.some((file) => chartChunks.includes(file.replace(/^\//, "")) || lazyChartLoaders.some((loader) => file.endsWith(loader)));
      return { route: id, gzipBytes, charts };
    });
}
