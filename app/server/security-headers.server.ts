/**
 * The headers every answer carries, set in one place: the express layer in
 * server/app.ts applies them to pages, resource routes, the API, static and
 * public files alike, in production and in development.
 *
 * Scripts run only from the app's own origin or with the per-request nonce
 * that the page's inline scripts (React Router's hydration data and its
 * module loader) carry; the nonce reaches the page through the router context
 * (`cspNonceContext`) and entry.server's `<ServerRouter nonce>`.
 */
import { randomBytes } from "node:crypto";
import { createContext } from "react-router";

/** This request's script nonce; empty outside a request the express layer saw (tests calling loaders directly). */
export const cspNonceContext = createContext<string>("");

/** 128 random bits, fresh for every answer: a nonce known to anyone in advance would let an injected script run. */
export const newCspNonce = () => randomBytes(16).toString("base64");

const isDevelopment = process.env.NODE_ENV !== "production";

export function contentSecurityPolicy(nonce: string) {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    // Stylesheets come from the app. The charts set their styles through the DOM, which a policy does not
    // govern. Only in development are styles inline: Vite injects each stylesheet as a <style> element.
    isDevelopment ? "style-src 'self' 'unsafe-inline'" : "style-src 'self'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    // The development server's hot reload talks over a websocket.
    isDevelopment ? "connect-src 'self' ws:" : "connect-src 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "object-src 'none'",
    "manifest-src 'self'",
  ].join("; ");
}

export function securityHeaders(nonce: string): Record<string, string> {
  return {
    "Content-Security-Policy": contentSecurityPolicy(nonce),
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "same-origin",
    "X-Frame-Options": "DENY",
  };
}

/** Adds each security header the answer does not set itself (to anything that can `has` and `set`). */
export function applySecurityHeaders(headers: { has(name: string): boolean; set(name: string, value: string): unknown }, nonce: string) {
  for (const [name, value] of Object.entries(securityHeaders(nonce))) {
    if (!headers.has(name)) headers.set(name, value);
  }
}
