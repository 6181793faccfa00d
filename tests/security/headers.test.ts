/**
 * What the built server sends and refuses in production: security headers on
 * pages, resource routes, the API, file downloads and public files; the
 * nonce-based Content-Security-Policy; API reads revalidated with
 * If-None-Match; the session cookie's
 * flags; cross-site form posts refused with nothing written; 429 from the
 * sign-in, invitation and API rate limits; and uploads that must not be
 * stored (SVG, oversize) or must be stored under a hash (a name with a path).
 * Photo types judged from bytes are covered by tests/integration/lab-photos.test.ts.
 */
import { mkdtempSync, readdirSync, readFileSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { and, count, eq } from "drizzle-orm";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { databaseFingerprint } from "~/db/backup.server";
import { db } from "~/db/client.server";
import { attachments, materials } from "~/db/schema";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { type RunningServer, startServer } from "../support/server";
import { DATA_REDIRECT_STATUS, demoStudyId, enrollmentOf, ONE_PIXEL_PNG, prepareDatabaseFile, signInOverHttp } from "./support";

const API_LIMIT = 5;
const FOREIGN = "https://elsewhere.example";
const PNG = ONE_PIXEL_PNG;

let server: RunningServer;
let uploadsDir: string;
let studyId: number;
let f1: number;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  uploadsDir = mkdtempSync(join(tmpdir(), "ringbatch-uploads-"));
  const { databaseUrl } = await prepareDatabaseFile(async () => ({}));
  // The test plays the proxy in front of the server, on the loopback interface, reporting client addresses.
  server = await startServer({ API_RATE_LIMIT_PER_MINUTE: String(API_LIMIT), UPLOADS_DIR: uploadsDir, TRUST_PROXY: "loopback" }, { databaseUrl });
  studyId = await demoStudyId("FF-2026-B");
  f1 = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, studyId), eq(materials.code, "F1")) }))!.id;
  for (const who of ["analyst5", "analyst7", "coordinator", "reviewer2"]) cookies[who] = await signInOverHttp(server.url, `${who}@ringbatch.example`, DEMO_PASSWORD);
});

afterAll(() => server?.stop());

const get = (path: string, cookie?: string) => fetch(server.url + path, { headers: cookie ? { Cookie: cookie } : {}, redirect: "manual" });

function postForm(path: string, body: URLSearchParams | FormData, { cookie, origin = server.url, forwardedFor }: { cookie?: string; origin?: string; forwardedFor?: string } = {}) {
  const headers: Record<string, string> = { Origin: origin };
  if (cookie) headers.Cookie = cookie;
  if (forwardedFor) headers["X-Forwarded-For"] = forwardedFor;
  return fetch(server.url + path, { method: "POST", headers, body, redirect: "manual" });
}

function uploadPhoto(bytes: Uint8Array, name: string, type: string) {
  const form = new FormData();
  form.set("intent", "photo");
  form.set("replicate", "1");
  form.set("photo", new File([bytes as BlobPart], name, { type }));
  return postForm(`/lab/studies/${studyId}/results/${f1}.data`, form, { cookie: cookies.analyst5 });
}

const attachmentCount = async () => (await db.select({ n: count() }).from(attachments))[0]!.n;

/** Every file under the uploads directory, relative to it. */
function storedFiles(dir = uploadsDir, prefix = ""): string[] {
  return readdirSync(dir).flatMap((name) => (statSync(join(dir, name)).isDirectory() ? storedFiles(join(dir, name), `${prefix}${name}/`) : [`${prefix}${name}`]));
}

function expectSecurityHeaders(response: Response) {
  const where = `${response.url} (${response.status})`;
  expect(response.headers.get("Content-Security-Policy"), where).toMatch(/frame-ancestors 'none'/);
  expect(response.headers.get("Content-Security-Policy"), where).toMatch(/default-src 'self'/);
  expect(response.headers.get("X-Content-Type-Options"), where).toBe("nosniff");
  expect(response.headers.get("Referrer-Policy"), where).toMatch(/^(no-referrer|same-origin|strict-origin|strict-origin-when-cross-origin)$/);
}

describe("security headers", () => {
  it("come with pages, error pages, resource routes and the API", async () => {
    const responses = await Promise.all([
      get("/login"),
      get("/no-such-page"),
      get(`/lab/studies/${studyId}`, cookies.analyst5),
      get("/healthz"),
      get("/api/v1/healthz"),
      get("/api/v1/studies", cookies.coordinator),
      get("/api/v1/studies"),
    ]);
    expect(responses.map((r) => r.status)).toEqual([200, 404, 200, 200, 200, 200, 401]);
    for (const response of responses) expectSecurityHeaders(response);
  });

  it("come with static files", async () => {
    const page = await (await get("/login")).text();
    const script = /src="(\/assets\/[^"]+\.js)"/.exec(page) ?? /href="(\/assets\/[^"]+\.css)"/.exec(page);
    const response = await get(script![1]!);
    expect(response.status).toBe(200);
    expectSecurityHeaders(response);
  });

  it("come with a file download, which is also served under its stored type", async () => {
    const upload = await uploadPhoto(PNG, "surface.png", "image/png");
    expect(upload.status).toBe(DATA_REDIRECT_STATUS);
    const attachment = (await db.select().from(attachments)).at(-1)!;
    const download = await get(`/files/${attachment.id}`, cookies.analyst5);
    expect(download.status).toBe(200);
    expect(download.headers.get("Content-Type")).toBe("image/png");
    expectSecurityHeaders(download);
  });
});

describe("the Content-Security-Policy", () => {
  const scriptSources = (policy: string) => policy.split(";").map((d) => d.trim()).find((d) => d.startsWith("script-src "))!;

  it("lets scripts run only from the app or with a fresh nonce that every inline script of the page carries", async () => {
    const [one, two] = await Promise.all([get("/login"), get("/login")]);
    const nonces = [];
    for (const response of [one, two]) {
      const scriptSrc = scriptSources(response.headers.get("Content-Security-Policy")!);
      expect(scriptSrc).not.toContain("'unsafe-inline'");
      expect(scriptSrc).not.toContain("'unsafe-eval'");
      expect(response.headers.get("Content-Security-Policy")).not.toContain("'unsafe-inline'");
      const nonce = /'nonce-([A-Za-z0-9+/=]+)'/.exec(scriptSrc)![1]!;
      // At least 128 bits (CSP Level 3, §7.1: "at least 128 bits long"), base64: 24 characters.
      expect(Buffer.from(nonce, "base64").length).toBeGreaterThanOrEqual(16);
      const page = await response.text();
      const scripts = page.match(/<script\b[^>]*>/g) ?? [];
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag, tag).toContain(`nonce="${nonce}"`);
      nonces.push(nonce);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
  });
});

describe("API reads revalidated with If-None-Match", () => {
  it("answer 304 with the security headers to a matching tag, and only to a caller who still has access", async () => {
    const checkingId = await demoStudyId("FF-2026-A");
    const cookie = await signInOverHttp(server.url, "reviewer3@ringbatch.example", DEMO_PASSWORD);
    const path = `/api/v1/studies/${checkingId}/precision`;
    const first = await get(path, cookie);
    expect(first.status).toBe(200);
    const etag = first.headers.get("ETag")!;
    expect(first.headers.get("Cache-Control")).toBe("private, no-cache");
    const revalidate = (withCookie?: string) => fetch(server.url + path, { headers: { "If-None-Match": etag, ...(withCookie ? { Cookie: withCookie } : {}) } });
    const repeat = await revalidate(cookie);
    expect(repeat.status).toBe(304);
    expect(repeat.headers.get("ETag")).toBe(etag);
    expect(await repeat.text()).toBe("");
    expectSecurityHeaders(repeat);
    expect((await revalidate()).status).toBe(401);
    expect((await revalidate(cookies.analyst5)).status).toBe(404);
    expect((await postForm("/logout", new URLSearchParams(), { cookie })).status).toBe(302);
    expect((await revalidate(cookie)).status).toBe(401);
  });
});

describe("the files browsers ask for", () => {
  it("are served from public/ with the security headers, and the pages link the icons and the manifest", async () => {
    const [svg, png, touch, robots, manifest] = await Promise.all(["/favicon.svg", "/favicon.png", "/apple-touch-icon.png", "/robots.txt", "/site.webmanifest"].map((path) => get(path)));
    for (const response of [svg, png, touch, robots, manifest]) {
      expect(response.status, response.url).toBe(200);
      expectSecurityHeaders(response);
    }
    expect(svg.headers.get("Content-Type")).toMatch(/^image\/svg\+xml/);
    expect(await svg.text()).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    // PNG signature, then the IHDR chunk's width and height as 4-byte big-endian integers (PNG specification, sections 5.2 and 11.2.2).
    for (const [response, size] of [[png, 32], [touch, 180]] as const) {
      const bytes = Buffer.from(await response.arrayBuffer());
      expect(bytes.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
      expect([bytes.readUInt32BE(16), bytes.readUInt32BE(20)]).toEqual([size, size]);
    }
    // The robots exclusion protocol (RFC 9309): "Disallow: /" for every user agent keeps crawlers out of every path.
    expect(await robots.text()).toMatch(/^User-agent: \*\r?\nDisallow: \/\s*$/m);
    const webManifest = await manifest.json();
    expect(webManifest.name).toBe("Ringbatch");
    expect(webManifest.icons.map((icon: { src: string }) => icon.src)).toEqual(["/favicon.svg", "/favicon.png", "/apple-touch-icon.png"]);
    const head = (await (await get("/login")).text()).split("</head>")[0]!;
    for (const link of ['rel="icon" href="/favicon.svg"', 'rel="icon" href="/favicon.png"', 'rel="apple-touch-icon" href="/apple-touch-icon.png"', 'rel="manifest" href="/site.webmanifest"']) {
      expect(head).toContain(link);
    }
  });
});

describe("the session cookie in production", () => {
  it("is httpOnly, SameSite=Lax and Secure", async () => {
    const response = await postForm("/login", new URLSearchParams({ email: "analyst6@ringbatch.example", password: DEMO_PASSWORD }));
    expect(response.status).toBe(302);
    const setCookie = response.headers.get("Set-Cookie")!;
    expect(setCookie).toMatch(/^__ringbatch_session=/);
    expect(setCookie).toMatch(/;\s*HttpOnly/i);
    expect(setCookie).toMatch(/;\s*SameSite=Lax/i);
    expect(setCookie).toMatch(/;\s*Secure/i);
  });
});

describe("cross-site form posts", () => {
  // Page actions are refused by React Router's own origin check (400) before any middleware runs;
  // resource routes and the API by the root middleware's (403). Either way nothing runs, and the
  // refusal carries the security headers (the server adds them to every answer).
  it("are refused with a 4xx on every action tried, and nothing is written", async () => {
    const before = await databaseFingerprint(db);
    // What the entry page sends: the changed replicate with the version it was read at (the demo's draft value, version 1).
    const draft = JSON.stringify({ rows: [{ response: "holes", replicate: 1, value: "33", testedOn: "", operator: "", readVersion: 1 }], fresh: {} });
    const csv = new FormData();
    csv.set("file", new File(["material,response,replicate,value\nF2,holes,1,9\n"], "results.csv", { type: "text/csv" }));
    const attempts = await Promise.all([
      postForm("/login", new URLSearchParams({ email: "analyst8@ringbatch.example", password: DEMO_PASSWORD }), { origin: FOREIGN }),
      postForm(`/lab/studies/${studyId}/results/${f1}`, new URLSearchParams({ intent: "draft", draft }), { cookie: cookies.analyst5, origin: FOREIGN }),
      postForm(`/lab/studies/${studyId}/results/${f1}.data`, new URLSearchParams({ intent: "draft", draft }), { cookie: cookies.analyst5, origin: "null" }),
      postForm(`/lab/studies/${studyId}/import`, csv, { cookie: cookies.analyst7, origin: FOREIGN }),
      postForm("/studies/new", new URLSearchParams({ code: "XS-1", title: "Cross-site", testMethod: "Slump", replicatesPerCell: "2" }), { cookie: cookies.coordinator, origin: FOREIGN }),
      postForm("/logout", new URLSearchParams(), { cookie: cookies.analyst7, origin: FOREIGN }),
      fetch(`${server.url}/api/v1/enrollments/${(await enrollmentOf(studyId, "analyst7@ringbatch.example")).id}/results`, {
        method: "POST",
        headers: { Origin: FOREIGN, Cookie: cookies.analyst7, "Content-Type": "application/json" },
        body: JSON.stringify({ results: [{ material: "F2", response: "holes", replicate: 1, value: 9 }] }),
      }),
    ]);
    expect(attempts.map((a) => a.status)).toEqual([400, 400, 400, 400, 400, 403, 403]);
    for (const attempt of attempts) expectSecurityHeaders(attempt);
    expect(await Promise.all(attempts.slice(5).map((a) => a.text()))).toEqual(["Cross-site request refused", "Cross-site request refused"]);
    expect(await databaseFingerprint(db)).toEqual(before);
    // The same draft from the app's own origin is saved: the origin alone made the difference.
    const own = await postForm(`/lab/studies/${studyId}/results/${f1}.data`, new URLSearchParams({ intent: "draft", draft }), { cookie: cookies.analyst5 });
    expect(own.status).toBe(200);
    expect((await databaseFingerprint(db)).resultsDigest).not.toBe(before.resultsDigest);
  });
});

describe("rate limits", () => {
  it("answer 429 on sign-in with a wait after 3 failures of one account from one address, while another address still signs in", async () => {
    const attempt = (password: string, forwardedFor: string) => postForm("/login", new URLSearchParams({ email: "reviewer3@ringbatch.example", password }), { forwardedFor });
    for (let i = 0; i < 3; i++) expect((await attempt("wrong-password", "198.51.100.7")).status).toBe(401);
    const limited = await attempt(DEMO_PASSWORD, "198.51.100.7");
    expect(limited.status).toBe(429);
    expect(await limited.text()).toContain("Several wrong passwords in a row: wait");
    expect((await attempt(DEMO_PASSWORD, "198.51.100.8")).status).toBe(302);
  });

  it("key on the connection's address when no proxy is trusted, whatever X-Forwarded-For a client sends", async () => {
    const direct = await startServer();
    try {
      const attempt = (password: string, forwardedFor: string) =>
        fetch(`${direct.url}/login`, {
          method: "POST",
          headers: { Origin: direct.url, "X-Forwarded-For": forwardedFor },
          body: new URLSearchParams({ email: "reviewer2@ringbatch.example", password }),
          redirect: "manual",
        });
      for (let i = 0; i < 3; i++) expect((await attempt("wrong-password", `198.51.100.${20 + i}`)).status).toBe(401);
      expect((await attempt(DEMO_PASSWORD, "198.51.100.99")).status).toBe(429);
    } finally {
      await direct.stop();
    }
  });

  it("answer 429 on invitation links after 20 unknown tokens from one address", async () => {
    const open = (token: string, forwardedFor: string) => fetch(`${server.url}/invite/${token}`, { headers: { "X-Forwarded-For": forwardedFor } });
    for (let i = 0; i < 20; i++) expect((await open(`guess-${i}`, "203.0.113.9")).status).toBe(404);
    const limited = await open("guess-20", "203.0.113.9");
    expect(limited.status).toBe(429);
    expect(await limited.text()).toContain("Too many attempts");
    expect((await open("guess-21", "203.0.113.10")).status).toBe(404);
  });

  it(`answer 429 on the API after ${API_LIMIT} requests a minute from one caller (API_RATE_LIMIT_PER_MINUTE)`, async () => {
    const statuses = [];
    for (let i = 0; i <= API_LIMIT; i++) statuses.push((await get("/api/v1/studies", cookies.reviewer2)).status);
    expect(statuses).toEqual([...Array.from({ length: API_LIMIT }, () => 200), 429]);
    const limited = await get("/api/v1/studies", cookies.reviewer2);
    expect(limited.status).toBe(429);
    expect(await limited.json()).toMatchObject({ error: { code: "rate_limited", message: `More than ${API_LIMIT} requests in a minute; wait and try again.` } });
    expectSecurityHeaders(limited);
  });
});

describe("uploads", () => {
  it("refuse an SVG, whatever its name or declared type, and store nothing", async () => {
    const svg = new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="1" height="1"/></svg>');
    const filesBefore = storedFiles();
    const rowsBefore = await attachmentCount();
    for (const [name, type] of [["surface.svg", "image/svg+xml"], ["surface.png", "image/png"], ["surface.jpg", "image/jpeg"]]) {
      const response = await uploadPhoto(svg, name!, type!);
      expect(response.status).toBe(400);
      expect(await response.text()).toContain("This file is not a JPG, PNG, WEBP file (judged from its contents, not its name).");
    }
    expect(await attachmentCount()).toBe(rowsBefore);
    expect(storedFiles()).toEqual(filesBefore);
  });

  it("refuse a photo over 10 MB and store nothing", async () => {
    const rowsBefore = await attachmentCount();
    const filesBefore = storedFiles();
    const big = new Uint8Array(10 * 1024 * 1024 + 1);
    big.set(PNG);
    const response = await uploadPhoto(big, "big.png", "image/png");
    expect(response.status).toBe(413);
    expect(await response.text()).toContain("The photo is larger than 10 MB.");
    expect(await attachmentCount()).toBe(rowsBefore);
    expect(storedFiles()).toEqual(filesBefore);
  });

  it("store a file named with a path under its content hash, and serve it under a neutral name", async () => {
    const names = ["../../x.png", "/etc/passwd.png", "..\\..\\evil.png", "C:\\temp\\surface.png"];
    for (const [i, name] of names.entries()) {
      // A different colour each, so each is a new stored file.
      const bytes = new Uint8Array(await sharp({ create: { width: 2, height: 2, channels: 3, background: { r: 10 * i, g: 20, b: 30 } } }).png().toBuffer());
      const response = await uploadPhoto(bytes, name, "image/png");
      expect(response.status, name).toBe(DATA_REDIRECT_STATUS);
      const attachment = (await db.select().from(attachments)).at(-1)!;
      expect(attachment.sha256).toMatch(/^[0-9a-f]{64}$/);
      const download = await get(`/files/${attachment.id}`, cookies.analyst5);
      expect(download.headers.get("Content-Disposition")).toMatch(/^inline; filename="L\d{2}-F1-[a-z_]+-rep1\.png"$/);
      const served = await sharp(Buffer.from(await download.arrayBuffer())).raw().toBuffer();
      expect([...served]).toEqual([...(await sharp(bytes).raw().toBuffer())]);
    }
    // On disk: only hash-named files under the uploads directory, and no uploaded name in them.
    const files = storedFiles();
    expect(files.length).toBeGreaterThan(0);
    for (const file of files) {
      expect(file).toMatch(/^[0-9a-f]{2}\/[0-9a-f]+\.(dat|meta\.json)$/);
      if (file.endsWith(".meta.json")) expect(readFileSync(join(uploadsDir, file), "utf8")).not.toMatch(/\.\.|x\.png|evil|passwd/);
    }
  });
});
