/**
 * `npm run profile -- /path`: serves the build in BUILD_DIR (default build/) under
 * `node --cpu-prof` on a fresh seeded database, loads one path for 5 s, and
 * prints where the server spent its time, by package and by function.
 */
import { spawn } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import autocannon from "autocannon";
import { startServer } from "../tests/support/server";
const path = process.argv[2] ?? "/healthz";
const probe = await startServer({ BUILD_DIR: process.env.BUILD_DIR ?? "build" });
const db = probe.databaseUrl; await probe.stop();
const dir = mkdtempSync(join(tmpdir(), "perf-prof-"));
const child = spawn(process.execPath, ["--cpu-prof", `--cpu-prof-dir=${dir}`, "server.js"], { env: { ...process.env, NODE_ENV: "production", BUILD_DIR: process.env.BUILD_DIR ?? "build", DATABASE_URL: db, PORT: "39123", APP_URL: "http://127.0.0.1:39123", SESSION_SECRET: "profile-session-secret" }, stdio: "ignore" });
for (let i = 0; i < 100; i++) { try { await fetch("http://127.0.0.1:39123/healthz"); break; } catch { await new Promise(r => setTimeout(r, 100)); } }
await autocannon({ url: `http://127.0.0.1:39123${path}`, connections: 10, duration: 5, headers: { "accept-encoding": "gzip" } });
child.kill("SIGINT"); await new Promise(r => child.once("exit", r));
const file = readdirSync(dir)[0]!;
const prof = JSON.parse(readFileSync(join(dir, file), "utf8"));
const self = new Map<number, number>(); const dt = prof.timeDeltas as number[];
prof.samples.forEach((id: number, i: number) => self.set(id, (self.get(id) ?? 0) + (dt[i] ?? 0)));
const byName = new Map<string, number>(); const byFile = new Map<string, number>();
let total = 0;
for (const node of prof.nodes) { const t = self.get(node.id) ?? 0; total += t; const cf = node.callFrame; const url = (cf.url || "(native)").replace(/.*node_modules\//, "").replace(/.*wt-perf\//, ""); const key = `${cf.functionName || "(anon)"} ${url}:${cf.lineNumber}`; byName.set(key, (byName.get(key) ?? 0) + t); const pkg = url.split("/").slice(0, url.startsWith("@") ? 2 : 1).join("/"); byFile.set(pkg, (byFile.get(pkg) ?? 0) + t); }
const top = (m: Map<string, number>, n: number) => [...m].sort((a, b) => b[1] - a[1]).slice(0, n).map(([k, v]) => `${(100 * v / total).toFixed(1).padStart(5)}% ${k}`).join("\n");
console.log("by package\n" + top(byFile, 18)); console.log("\nby function\n" + top(byName, 25));
