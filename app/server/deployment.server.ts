/**
 * What a production server needs before it answers anyone, and the checks
 * every request passes before its body is read: the configured host and the
 * body size caps. server/app.ts hooks these in front of everything else.
 */
import type { IncomingMessage, ServerResponse } from "node:http";

export const isProduction = (env: NodeJS.ProcessEnv = process.env) => env.NODE_ENV === "production";

/** The settings a production start refuses to do without, as sentences for the operator. */
export function productionConfigProblems(env: NodeJS.ProcessEnv = process.env) {
  if (!isProduction(env)) return [];
  const problems: string[] = [];
  if (!env.SESSION_SECRET) problems.push("SESSION_SECRET is not set: sign-in cookies would be signed with a secret anyone can read in the source.");
  if (!env.APP_URL) problems.push("APP_URL is not set: links in e-mails would point wherever a request's Host header says.");
  else if (!configuredOrigin(env)) problems.push(`APP_URL "${env.APP_URL}" is not an http(s) address such as https://ringbatch.example.org.`);
  return problems;
}

/** Throws one error naming every missing setting, so the server stops before listening. */
export function assertDeploymentConfig(env: NodeJS.ProcessEnv = process.env) {
  const problems = productionConfigProblems(env);
  if (problems.length > 0) throw new Error(`Ringbatch cannot start in production:\n- ${problems.join("\n- ")}`);
}

/** The origin of APP_URL, or null when it is unset or not an http(s) address. */
export function configuredOrigin(env: NodeJS.ProcessEnv = process.env) {
  if (!env.APP_URL) return null;
  try {
    const url = new URL(env.APP_URL);
    return url.protocol === "http:" || url.protocol === "https:" ? url : null;
  } catch {
    return null;
  }
}

/** Largest form or JSON body. */
export const FORM_BODY_LIMIT_BYTES = 1024 * 1024;
/** Largest upload body: the largest file a page accepts (10 MB) and room for the form's other fields. */
export const UPLOAD_BODY_LIMIT_BYTES = 10 * 1024 * 1024 + 256 * 1024;

export function bodyLimitFor(contentType: string | undefined) {
  return contentType?.toLowerCase().startsWith("multipart/form-data") ? UPLOAD_BODY_LIMIT_BYTES : FORM_BODY_LIMIT_BYTES;
}

function refuse(response: ServerResponse, status: number, message: string) {
  response.writeHead(status, { "Content-Type": "text/plain; charset=utf-8", Connection: "close" });
  response.end(message);
}

/**
 * Answers 421 when the request names another host than APP_URL's (a forged
 * Host must not reach the app, whose links and redirects use the host), and
 * 413 at once when the body is, or grows, larger than its cap, before anything
 * buffers it. Returns true when it has answered.
 */
export function refuseBeforeReading(request: IncomingMessage, response: ServerResponse, env: NodeJS.ProcessEnv = process.env) {
  const origin = configuredOrigin(env);
  // The health check is exempt: load balancers probe it by address.
  if (origin && request.url !== "/healthz" && request.headers.host?.toLowerCase() !== origin.host.toLowerCase()) {
    refuse(response, 421, `This server answers for ${origin.host} only.`);
    return true;
  }
  const limit = bodyLimitFor(request.headers["content-type"]);
  const tooLarge = `The request body is larger than ${Math.round(limit / 1024 / 1024)} MB.`;
  const declared = Number(request.headers["content-length"] ?? 0);
  if (declared > limit) {
    refuse(response, 413, tooLarge);
    request.resume();
    return true;
  }
  // A body without a declared length (chunked) is counted as the HTTP parser hands it over.
  if (request.headers["transfer-encoding"]) {
    let received = 0;
    const push = request.push.bind(request);
    request.push = (chunk: Buffer | null, encoding?: BufferEncoding) => {
      if (chunk) received += chunk.length;
      if (received > limit) {
        if (!response.headersSent) refuse(response, 413, tooLarge);
        request.destroy();
        return false;
      }
      return push(chunk, encoding);
    };
  }
  return false;
}
