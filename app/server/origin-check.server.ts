/**
 * Cross-site form posts carry a foreign Origin header; refuse them before any
 * action runs. Requests without Origin (scripts using tokens) pass: they cannot
 * ride on a browser's session cookie from another site.
 */
export function isForeignOrigin(request: Request) {
  if (["GET", "HEAD", "OPTIONS"].includes(request.method.toUpperCase())) return false;
  const origin = request.headers.get("Origin");
  if (!origin || origin === "null") return origin === "null";
  const allowed = new Set([new URL(request.url).origin, ...(process.env.ALLOWED_ORIGINS?.split(",") ?? [])]);
  const host = request.headers.get("Host");
  if (host) allowed.add(`${new URL(request.url).protocol}//${host}`);
  return !allowed.has(origin);
}
