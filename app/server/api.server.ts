/**
 * The JSON API's common ground: who is calling (a bearer token or the browser
 * session), what the token's scope allows, body limits, rate limits, and one
 * error shape — `{ "error": { "code", "message", "details"? } }` — for every
 * failure. Nothing from inside (a stack trace, a SQL message) ever leaves.
 */
import { createHash, randomBytes } from "node:crypto";
import type { z } from "zod";
import { idParam } from "~/lib/api/schemas";
import { enrollmentEnded, type StudyAccess, getUser, studyAccessFor } from "~/server/guards.server";
import { activeApiToken, type ApiToken } from "~/models/api-token.server";
import { loadSessionUser, type SessionUser } from "~/models/user.server";
import { API_REQUESTS, consume } from "~/server/rate-limit.server";

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const notYours = () => new ApiError(404, "not_found", "Not found.");

export const errorBody = (error: ApiError) => ({
  error: { code: error.code, message: error.message, ...(error.details === undefined ? {} : { details: error.details }) },
});

export function errorResponse(error: ApiError, headers?: HeadersInit) {
  return Response.json(errorBody(error), { status: error.status, headers });
}

/** Turns anything a handler throws into the API's error shape. */
export async function apiHandler(run: () => Promise<Response>): Promise<Response> {
  try {
    return await run();
  } catch (thrown) {
    if (thrown instanceof ApiError) return errorResponse(thrown);
    if (thrown instanceof Response) {
      // Guards redirect the signed-out to the sign-in page; an API caller gets 401 instead.
      if (thrown.status >= 300 && thrown.status < 400) return errorResponse(new ApiError(401, "unauthenticated", "Sign in or send a valid bearer token."));
      return errorResponse(thrown.status === 404 ? notYours() : new ApiError(thrown.status, "error", thrown.statusText || "Request refused."));
    }
    if (thrown && typeof thrown === "object" && (thrown as { type?: string }).type === "DataWithResponseInit") {
      const status = (thrown as { init?: ResponseInit }).init?.status ?? 500;
      return errorResponse(status === 404 ? notYours() : new ApiError(status, "error", "Request refused."));
    }
    console.error(thrown);
    return errorResponse(new ApiError(500, "internal", "Something went wrong on our side; nothing was changed."));
  }
}

export type ApiCaller = { user: SessionUser; token: ApiToken | null };

export const rateLimitKey = (caller: ApiCaller) => (caller.token ? `token:${caller.token.id}` : `user:${caller.user.id}`);

/** The calling user, from `Authorization: Bearer …` or else the session cookie; 401 when neither is valid. */
export async function requireApiCaller(request: Request): Promise<ApiCaller> {
  const authorization = request.headers.get("Authorization");
  let caller: ApiCaller | null = null;
  if (authorization) {
    const [scheme, value] = authorization.split(" ");
    const token = scheme?.toLowerCase() === "bearer" && value ? await activeApiToken(value.trim()) : null;
    const user = token ? await loadSessionUser(token.userId) : null;
    if (!token || !user) throw new ApiError(401, "unauthenticated", "The bearer token is not valid, or it was revoked.");
    caller = { user, token };
  } else {
    const user = await getUser(request);
    if (!user) throw new ApiError(401, "unauthenticated", "Sign in or send a valid bearer token.");
    caller = { user, token: null };
  }
  await enforceRateLimit(rateLimitKey(caller));
  return caller;
}

/**
 * The caller's access to a study, or 404. A token reaches only the study it
 * was made for, and a `results:write` token only writes (no reading here).
 */
export async function requireApiStudyAccess(request: Request, studyIdParam: string | undefined, allowed: StudyAccess[]) {
  const caller = await requireApiCaller(request);
  const id = idParam.safeParse(studyIdParam);
  if (!id.success) throw notYours();
  const studyId = id.data;
  if (caller.token && (caller.token.scope !== "study:read" || caller.token.studyId !== studyId)) throw notYours();
  const found = await studyAccessFor(caller.user, studyId);
  if (!found || !allowed.includes(found.access)) throw notYours();
  if (found.access === "analyst" && enrollmentEnded(found.enrollment)) throw notYours();
  return { ...caller, ...found };
}

/** What an API read sends: its text (or a file's bytes) and type, and any further headers (a download's file name). */
export type ApiRepresentation = { body: string | Uint8Array<ArrayBuffer>; contentType: string; headers?: Record<string, string> };

/**
 * What makes one caller's view differ from another's for the same URL: the
 * caller's access to the study (or role), and a token's scope and target.
 */
export function callerView(caller: ApiCaller & { access?: StudyAccess }) {
  return [caller.access ?? caller.user.roles.join("+"), caller.token ? [caller.token.scope, caller.token.studyId, caller.token.enrollmentId] : "session"];
}

/** Private: answers differ per caller; no-cache: a stored answer is used only after the server confirms it. */
const READ_CACHE_CONTROL = "private, no-cache";

// Ties entity tags to this process's code: after a deployment the same data may be presented differently.
const DEPLOYMENT_SALT = randomBytes(9).toString("base64url");

const digest = (value: string | Uint8Array) => createHash("sha256").update(value).digest("base64url");

/** Whether an If-None-Match header names `etag`; weak comparison, as RFC 9110 §13.1.2 prescribes for it. */
function ifNoneMatchHits(header: string | null, etag: string) {
  if (!header) return false;
  if (header.trim() === "*") return true;
  return header.split(",").some((candidate) => candidate.trim().replace(/^W\//, "") === etag);
}

/**
 * Answers an API read (after its access checks) with a strong ETag and
 * `Cache-Control: private, no-cache`: a client revalidates every time and gets
 * `304 Not Modified` while what it may see is unchanged.
 *
 * `version` lists everything the answer depends on besides the URL and the
 * caller's view (say, the study's data version and significance level); a
 * matching If-None-Match then answers 304 before `produce` runs. Reads that
 * no version covers pass `null`: their tag is a digest of the answer, so a
 * match still saves sending it, though not computing it.
 */
export async function conditionalRead(
  request: Request,
  view: unknown[],
  version: unknown[] | null,
  produce: () => Promise<ApiRepresentation>,
): Promise<Response> {
  const url = new URL(request.url);
  const tagOf = (content: unknown) => `"${digest(JSON.stringify([DEPLOYMENT_SALT, url.pathname, url.search, view, content]))}"`;
  const ifNoneMatch = request.headers.get("If-None-Match");
  const notModified = (etag: string) => new Response(null, { status: 304, headers: { ETag: etag, "Cache-Control": READ_CACHE_CONTROL } });
  let etag = version && tagOf(version);
  if (etag && ifNoneMatchHits(ifNoneMatch, etag)) return notModified(etag);
  const { body, contentType, headers } = await produce();
  etag ??= tagOf([contentType, headers ?? null, digest(body)]);
  if (ifNoneMatchHits(ifNoneMatch, etag)) return notModified(etag);
  // The length lets the server leave small answers uncompressed and compress large ones.
  return new Response(body, { headers: { ...headers, "Content-Type": contentType, "Content-Length": String(Buffer.byteLength(body)), ETag: etag, "Cache-Control": READ_CACHE_CONTROL } });
}

export const JSON_TYPE = "application/json; charset=utf-8";

/**
 * The query string, parsed with the route's schema from ~/lib/api/schemas
 * (which the OpenAPI document shows too); 422 `invalid_<parameter>` otherwise.
 */
export function readQuery<S extends z.ZodType>(request: Request, schema: S): z.output<S> {
  const parsed = schema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (parsed.success) return parsed.data;
  const [first] = parsed.error.issues;
  throw new ApiError(422, `invalid_${String(first?.path[0] ?? "query")}`, first?.message ?? "The query is not valid.", parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message })));
}

/**
 * Everything a study's precision figures depend on besides the query: the
 * engine reads only submitted results and decisions, and each change of
 * those moves the data version (see analysis.server.ts).
 */
export const analysisVersion = (study: { id: number; dataVersion: number; significanceLevel: number }) => [study.id, study.dataVersion, study.significanceLevel];

export const MAX_BODY_BYTES = 1024 * 1024;

/** Reads a JSON body of at most 1 MB: 413 above it, 400 when it is not JSON. */
export async function readJsonBody(request: Request): Promise<unknown> {
  const declared = Number(request.headers.get("Content-Length") ?? "0");
  if (declared > MAX_BODY_BYTES) throw new ApiError(413, "body_too_large", "The request body is larger than 1 MB.");
  const text = await readLimited(request);
  try {
    return JSON.parse(text);
  } catch {
    throw new ApiError(400, "malformed_json", "The request body is not valid JSON.");
  }
}

async function readLimited(request: Request) {
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > MAX_BODY_BYTES) {
      await reader.cancel();
      throw new ApiError(413, "body_too_large", "The request body is larger than 1 MB.");
    }
    chunks.push(value);
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(Buffer.concat(chunks));
  } catch {
    // Replacing bad bytes would store wrong characters without a word.
    throw new ApiError(400, "malformed_json", "The request body is not UTF-8 text.");
  }
}

/** `API_RATE_LIMIT_PER_MINUTE` overrides the limit (read on every request, so an operator or a test can change it). */
export function apiRateLimitMax(env: NodeJS.ProcessEnv = process.env) {
  const configured = Number(env.API_RATE_LIMIT_PER_MINUTE);
  return Number.isSafeInteger(configured) && configured > 0 ? configured : API_REQUESTS.max;
}

/** Counts a request of the caller's in the database (every app instance together); a 429 ApiError above the limit. */
export async function enforceRateLimit(key: string) {
  const max = apiRateLimitMax();
  const outcome = await consume({ ...API_REQUESTS, max }, key);
  if (!outcome.allowed) {
    throw new ApiError(429, "rate_limited", `More than ${max} requests in a minute; wait and try again.`, {
      retryAfterSeconds: outcome.retryAfterSeconds,
    });
  }
}
