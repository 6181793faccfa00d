/**
 * `npm run bench`: builds the app and the minimal framework app to compare
 * it with, prepares one database holding the demo, the generated 40 × 12
 * study, a study on its deadline day and ten years of archived studies,
 * serves it with `node server.js` as production does, and prints one line
 * per figure with its goal. It prints what it measured and asserts nothing.
 *
 * Everything goes through the real server's ordinary paths: the same routes,
 * access checks and caches any browser or script meets.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { and, eq, sql } from "drizzle-orm";
import { closeDatabase, db, migrateDatabase } from "../app/db/client.server";
import { enrollments, labs, materials, studies } from "../app/db/schema";
import { seedArchive } from "../seed/archive";
import { DEMO_LABS, DEMO_PASSWORD, DEMO_PEOPLE } from "../seed/demo-data";
import { deadlineAnalystEmail, deadlineCoordinatorEmail, seedDeadlineDay, seedLargeStudy } from "../seed/large-study";
import { seedDemo } from "../seed/seed";
import { startServer } from "../tests/support/server";
import { benchPrecisionEngine } from "./bench-precision";
import { pageOnTablet, whatIfInBrowser } from "./bench/chromium";
import { deadlineDay, ReadReplicates } from "./bench/deadline-day";
import { buildMinimalApp, startMinimalApp } from "./bench/minimal-app";
import { compareStacks, type StackRatio } from "./bench/stack";

const BUILD_DIR = process.env.BUILD_DIR ?? "build-bench";
const figures: string[] = [];
const line = (figure: string, measured: string, goal: string, met: boolean | null) =>
  figures.push(`${figure.padEnd(50)} ${measured.padEnd(52)} goal ${goal} — ${met === null ? "not measured" : met ? "met" : "NOT met"}`);
const note = (text: string) => figures.push(`   ${text}`);
const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]! : NaN;
};
const ms = (n: number) => `${n.toFixed(1)} ms`;
const cpuNote = (stack: StackRatio) =>
  `CPU per answer ${stack.cpuOurs.toFixed(2)} ms ours, ${stack.cpuMinimal.toFixed(2)} ms minimal = ${stack.cpuRatio.toFixed(2)} (steadier than req/s when others load the machine)`;
const step = (text: string) => console.log(`[${new Date().toISOString().slice(11, 19)}] ${text}`);

console.log(`Ringbatch benchmark — ${new Date().toISOString()} — node ${process.version}`);

step("precision engine on 1,000,000 values");
const engine = benchPrecisionEngine();
line("engine / summing pass (1,000,000 values)", `${ms(engine.analysisMs)} / ${ms(engine.sumMs)} = ${engine.ratio.toFixed(1)} ×`, "≤ 20 ×", engine.ratio <= 20);

step(`building the app into ${BUILD_DIR}/ and the minimal framework app`);
const build = spawnSync("npm", ["run", "-s", "build"], { env: { ...process.env, BUILD_DIR }, encoding: "utf8" });
if (build.status !== 0) throw new Error(`build failed:\n${build.stderr}`);
const minimalFolder = buildMinimalApp();
// For scale: the same yardstick with as many routes as ours (the framework's own cost grows with the table).
const ourRouteCount = Object.keys(routeManifest().routes).length;
const minimalSizedFolder = buildMinimalApp(ourRouteCount - 3);

step("preparing the database: demo, large study, deadline-day study, ten-year archive");
const databaseFile = join(mkdtempSync(join(tmpdir(), "ringbatch-bench-")), "bench.db");
process.env.DATABASE_URL = `file:${databaseFile}`;
await migrateDatabase();
await seedDemo(db);
const large = await seedLargeStudy(db);
const live = await seedDeadlineDay(db);
const archiveStarted = performance.now();
await seedArchive(db);
const archiveSeconds = (performance.now() - archiveStarted) / 1000;
await db.run(sql`pragma wal_checkpoint(truncate)`);
const databaseMegabytes = statSync(databaseFile).size / 1024 / 1024;
const testing = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!;
const [ownEnrollment] = await db
  .select({ id: enrollments.id })
  .from(enrollments)
  .innerJoin(labs, eq(labs.id, enrollments.labId))
  .where(and(eq(enrollments.studyId, testing.id), eq(labs.name, DEMO_LABS[7].name)));
const material = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, testing.id), eq(materials.code, "F2")) }))!;
const archived = (await db.query.studies.findFirst({ where: eq(studies.code, "AR-2020-150") }))!;
if (!ownEnrollment) throw new Error("demo enrollment missing");
closeDatabase();

// The per-caller API limit (600 a minute) would refuse most of the pollers' load as 429s: lift it for the run.
const server = await startServer({ BUILD_DIR, API_RATE_LIMIT_PER_MINUTE: "100000000" }, { databaseUrl: process.env.DATABASE_URL });
const minimal = await startMinimalApp(minimalFolder);
const minimalSized = await startMinimalApp(minimalSizedFolder);
try {
  const signIn = async (email: string) => {
    const response = await fetch(`${server.url}/login`, {
      method: "POST",
      redirect: "manual",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: server.url },
      body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
    });
    const cookie = response.headers.get("Set-Cookie")?.split(";")[0];
    if (!cookie) throw new Error(`sign-in of ${email} failed: ${response.status}`);
    return cookie;
  };
  const coordinator = await signIn(DEMO_PEOPLE.coordinator.email);
  const analyst8 = await signIn("analyst8@ringbatch.example");
  const analyst1 = await signIn("analyst1@ringbatch.example");

  /** `count` requests one after another; p50 and p95 of the time to the last byte, and how many were not 2xx. */
  const timeRequests = async (count: number, request: () => Promise<Response>) => {
    const durations: number[] = [];
    let notOk = 0;
    for (let i = 0; i < count; i++) {
      const start = performance.now();
      const response = await request();
      await response.arrayBuffer();
      if (!response.ok) notOk++;
      durations.push(performance.now() - start);
    }
    return { p50: percentile(durations, 50), p95: percentile(durations, 95), notOk };
  };
  const page = (path: string, cookie: string) => () => fetch(`${server.url}${path}`, { headers: { Cookie: cookie, "Accept-Encoding": "gzip" } });

  step("our stack against the minimal app, in turns");
  const health = await compareStacks(server, minimal, ["/healthz", "/healthz"]);
  const signInPage = await compareStacks(server, minimal, ["/login", "/page"]);
  line("/healthz ÷ minimal app's resource route, req/s", `${health.ours.toFixed(0)} / ${health.minimal.toFixed(0)} = ${health.ratio.toFixed(2)}`, "≥ 0.5", health.ratio >= 0.5 && health.notOk === 0);
  note(`per turn ${health.ratios.map((r) => r.toFixed(2)).join(", ")}; ${health.notOk} answers not 2xx; ${cpuNote(health)}`);
  line("/login ÷ minimal app's page, req/s", `${signInPage.ours.toFixed(0)} / ${signInPage.minimal.toFixed(0)} = ${signInPage.ratio.toFixed(2)}`, "≥ 0.5", signInPage.ratio >= 0.5 && signInPage.notOk === 0);
  note(`per turn ${signInPage.ratios.map((r) => r.toFixed(2)).join(", ")}; ${signInPage.notOk} answers not 2xx; autocannon, 10 connections, no Accept-Encoding; ${cpuNote(signInPage)}`);
  const gzipped = await compareStacks(server, minimal, ["/login", "/page"], { turns: 1, headers: { "Accept-Encoding": "gzip" } });
  note(`for scale: the same with Accept-Encoding: gzip, as browsers ask (only ours compresses): ${gzipped.ours.toFixed(0)} / ${gzipped.minimal.toFixed(0)} = ${gzipped.ratio.toFixed(2)}`);
  const sized = await compareStacks(server, minimalSized, ["/login", "/page"], { turns: 1 });
  note(`for scale: /login ÷ the minimal page with ${ourRouteCount} routes like ours: ${sized.ours.toFixed(0)} / ${sized.minimal.toFixed(0)} = ${sized.ratio.toFixed(2)} req/s; ${cpuNote(sized)}`);

  step("analysis loader and single-user autosave");
  const analysis = await timeRequests(200, () => fetch(`${server.url}/studies/${large.id}/analysis.data`, { headers: { Cookie: coordinator } }));
  line("analysis page loader (40 × 12 study), 200 in a row", `p50 ${ms(analysis.p50)}, p95 ${ms(analysis.p95)}`, "p95 ≤ 50 ms", analysis.p95 <= 50 && analysis.notOk === 0);
  // One replicate retyped back and forth, as an analyst correcting a value, each save naming the version it read.
  const replicates = await ReadReplicates.of(ownEnrollment!.id, material.id);
  let flip = 0;
  const autosave = await timeRequests(200, async () => {
    const value = String(8 + (flip++ % 2));
    const response = await fetch(`${server.url}/lab/studies/${testing.id}/results/${material.id}.data`, {
      method: "POST",
      headers: { Cookie: analyst8, Origin: server.url, "Content-Type": "application/x-www-form-urlencoded" },
      body: replicates.body("holes:3", value),
    });
    if (response.ok) replicates.saved("holes:3", value);
    return response;
  });
  line("one analyst's autosave round trip, 200 in a row", `p50 ${ms(autosave.p50)}, p95 ${ms(autosave.p95)}`, "p95 ≤ 50 ms", autosave.p95 <= 50 && autosave.notOk === 0);

  step("deadline day: 40 analysts, 5 coordinators, 3 reviewers for 60 s");
  const day = await deadlineDay({
    url: server.url,
    studyId: live.study.id,
    materialIds: live.materials.map((m) => m.id),
    reviewStudyId: large.id,
    analysts: Array.from({ length: 40 }, (_, i) => deadlineAnalystEmail(i)),
    coordinators: [DEMO_PEOPLE.coordinator.email, ...Array.from({ length: 4 }, (_, i) => deadlineCoordinatorEmail(i))],
    reviewers: DEMO_PEOPLE.reviewers.map((r) => r.email),
    signIn,
  });
  const all = day.timings.map((t) => t.ms);
  line(
    "deadline day, all requests",
    `${day.timings.length} requests, p95 ${ms(percentile(all, 95))}, ${day.failures.length} errors`,
    "p95 ≤ 50 ms, no error",
    percentile(all, 95) <= 50 && day.failures.length === 0,
  );
  for (const kind of ["autosave", "progress poll", "review page"] as const) {
    const of = day.timings.filter((t) => t.kind === kind).map((t) => t.ms);
    note(`${kind}: ${of.length}, p50 ${ms(percentile(of, 50))}, p95 ${ms(percentile(of, 95))}, max ${ms(Math.max(...of))}`);
  }
  for (const failure of day.failures.slice(0, 5)) note(`error: ${failure}`);
  line("deadline day, acknowledged saves present afterwards", `${day.checked - day.missing.length} of ${day.checked} values`, "all", day.checked > 0 && day.missing.length === 0);
  for (const missing of day.missing.slice(0, 5)) note(`missing: ${missing}`);
  line("progress polls with If-None-Match answered 304 (deadline day)", `${day.notModified} of ${day.polls}`, "(printed)", true);
  note("while 40 labs save, the progress moves between most polls, so most polls get the new answer");

  step("conditional GETs on a study at rest");
  let quietPolls = 0;
  let quiet304 = 0;
  for (const path of [`/api/v1/studies/${large.id}/progress`, `/api/v1/studies/${large.id}/precision`]) {
    let etag: string | null = null;
    for (let i = 0; i < 20; i++) {
      const response: Response = await fetch(`${server.url}${path}`, { headers: { Cookie: coordinator, ...(etag ? { "If-None-Match": etag } : {}) } });
      await response.arrayBuffer();
      quietPolls++;
      if (response.status === 304) quiet304++;
      etag = response.headers.get("ETag") ?? etag;
    }
  }
  line("polls with If-None-Match answered 304 (study at rest)", `${quiet304} of ${quietPolls} = ${((100 * quiet304) / quietPolls).toFixed(0)} %`, "all but each poller's first", quiet304 === quietPolls - 2);

  step("ten years of studies: list and page reads");
  line("archive written (300 studies, 12,000 enrollments, 1,000,000 results)", `${archiveSeconds.toFixed(1)} s; database ${databaseMegabytes.toFixed(1)} MB`, "minutes at most", archiveSeconds < 300);
  const archivePages: [string, () => Promise<Response>][] = [
    ["studies list, first page", page("/studies", coordinator)],
    ["studies list, page 10", page("/studies?page=10", coordinator)],
    ["lab home (a lab in ~100 studies)", page("/lab", analyst1)],
    ["overview of an archived study", page(`/studies/${archived.id}`, coordinator)],
    ["results of an archived study", page(`/studies/${archived.id}/results`, coordinator)],
    ["API study list", page("/api/v1/studies", coordinator)],
  ];
  for (const [name, request] of archivePages) {
    const timing = await timeRequests(100, request);
    line(`archive: ${name}, 100 in a row`, `p50 ${ms(timing.p50)}, p95 ${ms(timing.p95)}${timing.notOk ? `, ${timing.notOk} not 2xx` : ""}`, "p95 ≤ 50 ms", timing.p95 <= 50 && timing.notOk === 0);
  }

  step("the large study's pages in Chromium at 4× CPU slowdown");
  const reviewer = await signIn(DEMO_PEOPLE.reviewers[0]!.email);
  for (const [name, path, cookie] of [
    ["analysis", `/studies/${large.id}/analysis`, coordinator],
    ["results", `/studies/${large.id}/results`, coordinator],
    ["review", `/review/${large.id}`, reviewer],
  ] as const) {
    const tablet = await pageOnTablet(`${server.url}${path}`, cookie);
    line(
      `${name} page, 40 × 12 study, Chromium at 4× slowdown`,
      `DOMContentLoaded ${ms(tablet.domContentLoadedMs)}, ${tablet.elements} elements, ${(tablet.htmlBytes / 1024).toFixed(0)} kB HTML`,
      "≤ 1 s, ≤ 5,000 elements",
      tablet.domContentLoadedMs <= 1000 && tablet.elements <= 5000,
    );
  }
  step("the exclusion preview, recomputed in Chromium for one cell of the 40 × 12 study");
  const whatIf = await whatIfInBrowser(`${server.url}/studies/${large.id}/analysis`, coordinator, 1);
  line(
    `what-if exclusion recomputed in the browser, ${whatIf.runs} toggles`,
    `median ${ms(whatIf.medianMs)}, slowest ${ms(whatIf.maxMs)}`,
    "≤ 16 ms",
    whatIf.maxMs <= 16,
  );
  note(`the first toggle, before the engine is compiled: ${ms(whatIf.firstMs)}`);
  const onTablet = await whatIfInBrowser(`${server.url}/studies/${large.id}/analysis`, coordinator, 4);
  note(`the same at 4× CPU slowdown: median ${ms(onTablet.medianMs)}, slowest ${ms(onTablet.maxMs)}, first ${ms(onTablet.firstMs)}`);
} finally {
  await Promise.all([server.stop(), minimal.stop(), minimalSized.stop()]);
}

step("JavaScript per page from the build's manifest");
const perPage = javascriptPerPage();
for (const page of perPage) {
  const goal = page.route.includes("result-entry") ? "≤ 150 kB" : "";
  if (goal || page.charts) line(`JS for ${page.route}`, `${(page.gzipBytes / 1024).toFixed(1)} kB gzip${page.charts ? ", can load charts" : ""}`, goal || "charts only on chart pages", goal ? page.gzipBytes <= 150 * 1024 : true);
}
// The pages that draw charts: the analysis, the review ballot, the report, a proficiency round's letter, a ruggedness study's effects.
const chartsElsewhere = perPage.filter((p) => p.charts && !/study\/(analysis|ballot|report|effects)$|round\/letter$/.test(p.route));
line("charting library on pages without charts", chartsElsewhere.map((p) => p.route).join(", ") || "none", "none", chartsElsewhere.length === 0);
const heaviest = [...perPage].sort((a, b) => b.gzipBytes - a.gzipBytes)[0]!;
note(`heaviest page up front: ${heaviest.route}, ${(heaviest.gzipBytes / 1024).toFixed(1)} kB gzip`);

console.log(`\nfigures — ${new Date().toISOString()}\n${figures.join("\n")}`);

/** The build's route manifest, as React Router sends it to the browser. */
function routeManifest() {
  const assets = join(BUILD_DIR, "client", "assets");
  const text = readFileSync(join(assets, readdirSync(assets).find((f) => /^manifest-.*\.js$/.test(f))!), "utf8");
  return JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as {
    entry: { module: string; imports: string[] };
    routes: Record<string, { module: string; imports?: string[] }>;
  };
}

/**
 * Gzipped JavaScript each route loads up front (entry, root, route module and
 * their imports), from the build's route manifest, and whether the page can
 * load the charting library (statically, or through a lazy import of its chunk).
 */
function javascriptPerPage() {
  const assets = join(BUILD_DIR, "client");
  const manifest = routeManifest();
  const content = (file: string) => readFileSync(join(assets, file));
  // echarts' renderer library is bundled into the chart chunk; no other code carries its name.
  const chartChunks = readdirSync(join(assets, "assets"))
    .filter((f) => f.endsWith(".js") && content(`assets/${f}`).includes("zrender"))
    .map((f) => `assets/${f}`);
  const lazyChartLoaders = readdirSync(join(assets, "assets")).filter(
    (f) => f.endsWith(".js") && chartChunks.some((chunk) => content(`assets/${f}`).includes(chunk.slice("assets/".length))),
  );
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
