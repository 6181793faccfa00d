/**
 * Headers sent with every response. The page needs no third-party origin:
 * fonts and scripts are served by the app itself. React Router's inline
 * hydration script needs 'unsafe-inline' for scripts.
 */
export const SECURITY_HEADERS: Record<string, string> = {
  "Content-Security-Policy": [
    "default-src 'self'",
    "script-src 'self' 'unsafe-inline'",
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    // The dev server's hot reload talks over a websocket.
    process.env.NODE_ENV === "development" ? "connect-src 'self' ws:" : "connect-src 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "object-src 'none'",
  ].join("; "),
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "same-origin",
  "X-Frame-Options": "DENY",
};

/** Adds each security header the response does not set itself (to a Headers, or anything that can `has` and `set`). */
export function applySecurityHeaders(headers: Pick<Headers, "has" | "set">) {
  for (const [name, value] of Object.entries(SECURITY_HEADERS)) {
    if (!headers.has(name)) headers.set(name, value);
  }
}

export function withSecurityHeaders(response: Response) {
  applySecurityHeaders(response.headers);
  return response;
}
