/**
 * Repeat reads of a study's precision figures, answered from memory.
 *
 * A script or dashboard polling `GET /api/v1/studies/:id/precision` would
 * otherwise pay for the whole framework request and four access queries on
 * every call. When the route has answered a caller once, the caller's access
 * is remembered together with the access version, and the server answers the
 * same caller's next read of the same study itself while the version is the
 * same: whoever wrote, nothing a guard reads has changed, so every guard would
 * decide as before (and the study's data version, which keys the cached
 * analysis, is still the remembered one). A session past its end, a token due
 * for its last-use record, an analysis not cached, or anything unusual in the
 * request goes the full way through the route instead.
 */
import { createHash } from "node:crypto";
import type { IncomingHttpHeaders } from "node:http";
import type { studies } from "~/db/schema";
import { type ApiCaller, ApiError, enforceRateLimit, errorBody, rateLimitKey } from "~/server/api.server";
import { currentAccessVersion, type StudyAccess } from "~/server/guards.server";
import { isSignificanceLevel } from "~/lib/precision";
import { SECURITY_HEADERS } from "~/server/security-headers.server";
import { sessionEndsAt } from "~/server/session.server";
import { cachedAnalysisBytes } from "~/models/analysis.server";
import { lastUseRecordedUntil } from "~/models/api-token.server";

/** Who may read a study's precision figures through the API. */
export const PRECISION_READERS: StudyAccess[] = ["admin", "coordinator", "reviewer"];

export const PRECISION_CONTENT_TYPE = "application/json; charset=utf-8";

const PRECISION_PATH = /^\/api\/v1\/studies\/(\d{1,15})\/precision$/;

/** The `alpha` query parameter: absent (the study's own level) or one of the engine's levels. */
export function precisionAlpha(searchParams: URLSearchParams): number | undefined {
  const param = searchParams.get("alpha");
  if (param === null) return undefined;
  const alpha = Number(param);
  if (!isSignificanceLevel(alpha)) throw new ApiError(422, "invalid_alpha", "alpha must be 0.005, 0.01 or 0.05.");
  return alpha;
}

type Study = typeof studies.$inferSelect;
type RememberedReader = { accessVersion: number; validUntil: number; study: Study; rateKey: string };

const remembered = new Map<string, RememberedReader>();
const REMEMBERED_LIMIT = 1000;

/** The credential the API's guards read (the bearer token, else the cookie), hashed so no secret is kept. */
function credentialKey(authorization: string | null | undefined, cookie: string | null | undefined) {
  const credential = authorization ? `bearer\n${authorization}` : cookie ? `cookie\n${cookie}` : null;
  return credential && createHash("sha256").update(credential).digest("base64url");
}

/**
 * After the route has served `caller` in full, keeps what a repeat read needs.
 * `accessVersion` is the one read before the guards ran, so a write that raced
 * the checks leaves an entry that will never match.
 */
export async function rememberPrecisionReader(request: Request, caller: ApiCaller & { study: Study }, accessVersion: number | null) {
  const key = credentialKey(request.headers.get("Authorization"), request.headers.get("Cookie"));
  if (accessVersion === null || !key) return;
  const validUntil = caller.token ? lastUseRecordedUntil(caller.token) : await sessionEndsAt(request.headers.get("Cookie"));
  if (validUntil === null || validUntil <= Date.now()) return;
  if (remembered.size >= REMEMBERED_LIMIT) remembered.delete(remembered.keys().next().value!);
  remembered.set(`${key}:${caller.study.id}`, { accessVersion, validUntil, study: caller.study, rateKey: rateLimitKey(caller) });
}

export type DirectAnswer = { status: number; headers: Record<string, string | number>; body: Buffer };

/**
 * The answer to a repeat precision read, or null when the request must go
 * through the route (not such a read, nothing remembered, or anything changed).
 */
export async function answerRepeatPrecisionRead(method: string | undefined, url: string | undefined, headers: IncomingHttpHeaders): Promise<DirectAnswer | null> {
  if (method !== "GET" || !url?.startsWith("/api/v1/studies/")) return null;
  const { pathname, searchParams } = new URL(url, "http://localhost");
  const studyId = PRECISION_PATH.exec(pathname)?.[1];
  const key = studyId && credentialKey(headers.authorization, headers.cookie);
  const reader = key ? remembered.get(`${key}:${studyId}`) : undefined;
  if (!reader || reader.validUntil <= Date.now()) return null;
  if ((await currentAccessVersion()) !== reader.accessVersion) {
    remembered.delete(`${key}:${studyId}`);
    return null;
  }
  let alpha: number | undefined;
  try {
    alpha = precisionAlpha(searchParams);
  } catch {
    return null;
  }
  const body = cachedAnalysisBytes(reader.study, alpha);
  if (!body) return null;
  const answer = (status: number, bytes: Buffer): DirectAnswer => ({
    status,
    headers: { ...SECURITY_HEADERS, "Content-Type": PRECISION_CONTENT_TYPE, "Content-Length": bytes.length },
    body: bytes,
  });
  try {
    await enforceRateLimit(reader.rateKey);
  } catch (error) {
    if (!(error instanceof ApiError)) throw error;
    return answer(error.status, Buffer.from(JSON.stringify(errorBody(error))));
  }
  return answer(200, body);
}
