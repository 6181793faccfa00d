/**
 * Starts the real built server (`node server.js` on build/) against a fresh,
 * migrated and seeded SQLite file, on a free localhost port.
 */
import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";

async function freePort() {
  return new Promise<number>((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

export type RunningServer = {
  url: string;
  /** The server process's id (the benchmark reads its CPU time). */
  pid: number;
  databaseUrl: string;
  stop: () => Promise<void>;
  /** Ends the process at once (SIGKILL), as a crash or a power cut would: no shutdown code runs. */
  kill: () => Promise<void>;
  /** The tail of the server's log. */
  output: () => string;
};

/** `databaseUrl` reuses a prepared database (still migrated and seeded, which is idempotent). */
export async function startServer(extraEnv: Record<string, string> = {}, { databaseUrl }: { databaseUrl?: string } = {}): Promise<RunningServer> {
  const buildDirectory = extraEnv.BUILD_DIR ?? process.env.BUILD_DIR ?? "build";
  const serverBuild = join(buildDirectory, "server/index.js");
  if (!existsSync(serverBuild)) throw new Error(`No build at ${serverBuild}: run \`npm run build\` before the browser tests.`);
  // A prepared database already has its accounts, so the first-use step would write nothing: skip its start-up cost.
  const prepared = databaseUrl !== undefined;
  databaseUrl ??= `file:${join(mkdtempSync(join(tmpdir(), "ringbatch-e2e-")), "e2e.db")}`;
  const port = await freePort();
  const url = `http://localhost:${port}`;
  // A production start as the README describes it, with the demo and the local mailbox switched on for the tests.
  const env = {
    ...process.env,
    NODE_ENV: "production",
    DATABASE_URL: databaseUrl,
    PORT: String(port),
    APP_URL: url,
    SESSION_SECRET: "test-suite-session-secret",
    DEMO: "on",
    MAILBOX: "on",
    // Scheduled notices would send mail on their own clock in the middle of a test; tests run the tick themselves.
    NOTICE_SCHEDULE: "off",
    ...extraEnv,
    BUILD_DIR: buildDirectory,
  };
  for (const script of prepared ? ["scripts/db-setup.ts"] : ["scripts/db-setup.ts", "scripts/db-seed.ts"]) {
    const setup = spawnSync("node_modules/.bin/tsx", [script], { env, encoding: "utf8" });
    if (setup.status !== 0) throw new Error(`${script} failed: ${setup.stderr}`);
  }
  const child: ChildProcess = spawn(process.execPath, ["server.js"], { env, stdio: ["ignore", "pipe", "pipe"] });
  // Keep the tail of the server's log for error messages (a line per request only with REQUEST_LOG set).
  let output = "";
  const keep = (chunk: Buffer) => (output = (output + chunk).slice(-20_000));
  child.stdout!.on("data", keep);
  child.stderr!.on("data", keep);
  const deadline = Date.now() + 20_000;
  while (true) {
    try {
      if ((await fetch(`${url}/healthz`)).ok) break;
    } catch {
      // not listening yet
    }
    if (child.exitCode !== null || Date.now() > deadline) throw new Error(`Server did not start:\n${output}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  const end = (signal: NodeJS.Signals) =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) return resolve();
      child.once("exit", () => resolve());
      child.kill(signal);
    });
  return { url, pid: child.pid!, databaseUrl, stop: () => end("SIGTERM"), kill: () => end("SIGKILL"), output: () => output };
}
