/**
 * The JSON API's common ground: who is calling (a bearer token or the browser
 * session), what the token's scope allows, body limits, rate limits, and one
 * error shape — `{ "error": { "code", "message", "details"? } }` — for every
 * failure. Nothing from inside (a stack trace, a SQL message) ever leaves.
 */
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
  const studyId = Number(studyIdParam);
  if (!Number.isSafeInteger(studyId) || studyId <= 0) throw notYours();
  if (caller.token && (caller.token.scope !== "study:read" || caller.token.studyId !== studyId)) throw notYours();
  const found = await studyAccessFor(caller.user, studyId);
  if (!found || !allowed.includes(found.access)) throw notYours();
  if (found.access === "analyst" && enrollmentEnded(found.enrollment)) throw notYours();
  return { ...caller, ...found };
}

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
