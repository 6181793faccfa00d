/**
 * The outside review's findings that only the real built server shows: body
 * caps before buffering (4), the configured host (7), and what a production
 * start refuses or prints (2, 7, 12). Numbered as in the review.
 */
import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { request as httpRequest } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type RunningServer, startServer } from "../support/server";
import { recordFigure } from "./figures";
import { prepareDatabaseFile } from "./support";

let server: RunningServer;
let findingsChecked = 0;
const checked = () => void findingsChecked++;

beforeAll(async () => {
  const { databaseUrl } = await prepareDatabaseFile(async () => ({}));
  server = await startServer({}, { databaseUrl });
});

afterAll(async () => {
  await server?.stop();
  recordFigure("review-findings-server", "findingsChecked", findingsChecked);
});

type RawAnswer = { status: number; elapsedMs: number; bytesSent: number };

/**
 * Posts to the server while writing the body slowly, chunk after chunk, and
 * reports when the answer came and how much of the body had been sent by then.
 */
function slowPost(path: string, { declaredLength, chunkBytes, chunks, host }: { declaredLength?: number; chunkBytes: number; chunks: number; host?: string }) {
  const url = new URL(path, server.url);
  return new Promise<RawAnswer>((resolve, reject) => {
    const started = Date.now();
    let bytesSent = 0;
    let answered = false;
    const headers: Record<string, string> = { "Content-Type": "application/x-www-form-urlencoded", Origin: server.url };
    if (declaredLength !== undefined) headers["Content-Length"] = String(declaredLength);
    if (host) headers.Host = host;
    const request = httpRequest({ hostname: url.hostname, port: url.port, path: url.pathname, method: "POST", headers }, (response) => {
      answered = true;
      response.resume();
      resolve({ status: response.statusCode!, elapsedMs: Date.now() - started, bytesSent });
      request.destroy();
    });
    request.on("error", (error) => (answered ? undefined : reject(error)));
    const chunk = Buffer.alloc(chunkBytes, "a");
    let written = 0;
    const writeNext = () => {
      if (answered || request.destroyed) return;
      if (written === chunks) return void request.end();
      written++;
      bytesSent += chunk.length;
      request.write(chunk, () => setTimeout(writeNext, 20));
    };
    writeNext();
  });
}

describe("4. body size limits before buffering", () => {
  it("answers 413 at once to a declared 100 MB post to /login, after reading almost none of it", async () => {
    const answer = await slowPost("/login", { declaredLength: 100 * 1024 * 1024, chunkBytes: 64 * 1024, chunks: 1600 });
    expect(answer.status).toBe(413);
    expect(answer.bytesSent).toBeLessThan(2 * 1024 * 1024);
    checked();
  });

  it("answers 413 to a form body sent in chunks with no declared length, once it passes 1 MB", async () => {
    const answer = await slowPost("/login", { chunkBytes: 64 * 1024, chunks: 1600 });
    expect(answer.status).toBe(413);
    expect(answer.bytesSent).toBeLessThan(4 * 1024 * 1024);
    checked();
  });

  it("lets an ordinary sign-in through", async () => {
    const response = await fetch(`${server.url}/login`, {
      method: "POST",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: server.url },
      body: new URLSearchParams({ email: "coordinator@ringbatch.example", password: "ringbatch-demo" }),
      redirect: "manual",
    });
    expect(response.status).toBe(302);
  });
});

describe("7. the configured host", () => {
  it("answers 421 to a request that names another Host, and serves the configured one", async () => {
    const forged = await slowPost("/login", { chunkBytes: 10, chunks: 1, host: "attacker.example" });
    expect(forged.status).toBe(421);
    const page = await fetch(`${server.url}/login`);
    expect(page.status).toBe(200);
    checked();
  });
});

/** Runs the setup scripts and starts the built server with `env`, without the test defaults; resolves with how it ended or its first lines. */
function productionStart(env: Record<string, string>) {
  const databaseUrl = `file:${join(mkdtempSync(join(tmpdir(), "ringbatch-start-")), "start.db")}`;
  const full = { PATH: process.env.PATH!, NODE_ENV: "production", DATABASE_URL: databaseUrl, BUILD_DIR: process.env.BUILD_DIR ?? "build", PORT: "0", ...env };
  const setup = spawnSync("node_modules/.bin/tsx", ["scripts/db-setup.ts"], { env: full, encoding: "utf8" });
  const seed = spawnSync("node_modules/.bin/tsx", ["scripts/db-seed.ts"], { env: full, encoding: "utf8" });
  return new Promise<{ setup: string; seed: string; exitCode: number | null; output: string }>((resolve) => {
    const child = spawn(process.execPath, ["server.js"], { env: full, stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    const collect = (chunk: Buffer) => (output += chunk);
    child.stdout.on("data", collect);
    child.stderr.on("data", collect);
    const timer = setTimeout(() => child.kill("SIGTERM"), 8000);
    child.on("exit", (code) => {
      clearTimeout(timer);
      resolve({ setup: setup.stdout + setup.stderr, seed: seed.stdout + seed.stderr, exitCode: code, output });
    });
    child.stdout.on("data", () => {
      if (output.includes("serving")) child.kill("SIGTERM");
    });
  });
}

describe("2, 7, 12. a production start", () => {
  it("refuses to start without APP_URL or SESSION_SECRET, naming each", async () => {
    const neither = await productionStart({});
    expect(neither.exitCode).not.toBe(0);
    expect(neither.output).toContain("SESSION_SECRET is not set");
    expect(neither.output).toContain("APP_URL is not set");
    const noSecret = await productionStart({ APP_URL: "https://ringbatch.example.org" });
    expect(noSecret.exitCode).not.toBe(0);
    expect(noSecret.output).toContain("SESSION_SECRET is not set");
    expect(noSecret.output).not.toContain("APP_URL is not set");
    checked();
  });

  it("writes no demo into an empty production database and prints a one-time link for the first administrator", async () => {
    const started = await productionStart({ APP_URL: "https://ringbatch.example.org", SESSION_SECRET: "a-production-secret" });
    expect(started.setup).toContain("migrations applied");
    expect(started.seed).toMatch(/Create the first administrator within 30 minutes \(the link works once\):\n {2}https:\/\/ringbatch\.example\.org\/setup\/[A-Za-z0-9_-]{43}\n/);
    expect(started.seed).not.toContain("demo data written");
    expect(started.output).toContain("serving");
    checked();
  });
});
