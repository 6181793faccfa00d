/**
 * The server's own request handling, the same in production (built with the
 * app by Vite, so it shares the app's modules and their caches) and in
 * development (loaded through Vite by server.js).
 *
 * `frontDoor` runs first for every request, static files included: the
 * client's address, compression, and the security headers with this
 * answer's script nonce. `requestHandler` is React Router.
 */
import { constants as zlibConstants } from "node:zlib";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import onHeaders from "on-headers";
import { RouterContextProvider } from "react-router";
import * as build from "virtual:react-router/server-build";
import { assertDeploymentConfig, refuseBeforeReading } from "~/server/deployment.server";
import { startNoticeSchedule } from "~/server/notice-schedule.server";
import { applySecurityHeaders, cspNonceContext, newCspNonce } from "~/server/security-headers.server";

/** The server entry (server.js) starts the scheduled notices once it listens; see notice-schedule.server. */
export { startNoticeSchedule };

// A production start without APP_URL or SESSION_SECRET stops here, naming what is missing.
assertDeploymentConfig();

/** Express's "trust proxy" from TRUST_PROXY: unset trusts no proxy, a number counts hops, anything else names addresses or subnets. */
function trustedProxies(value = process.env.TRUST_PROXY) {
  if (!value || value === "false") return false;
  if (value === "true") return true;
  return /^\d+$/.test(value) ? Number(value) : value;
}

/**
 * Compression pays on pages, route data and large answers, not on a health
 * check or a small API answer. An answer with a Content-Length is left to the
 * threshold (1 kB); one streamed without it (how React Router sends every
 * answer) is compressed only when it is a document or route data, which are
 * seldom small. Without this, every streamed answer went through zlib.
 */
function worthCompressing(request: express.Request, response: express.Response) {
  if (!compression.filter(request, response)) return false;
  if (response.hasHeader("Content-Length")) return true;
  return /^text\/(html|x-script)/.test(String(response.getHeader("Content-Type") ?? ""));
}

const trustProxy = trustedProxies();
export const frontDoor = express();
frontDoor.disable("x-powered-by");
frontDoor.set("trust proxy", trustProxy);
// The rate limits key on X-Forwarded-For: replace whatever the client sent with the address express trusts.
// Trusting no proxy, that is the peer's own address; asking express for it would parse X-Forwarded-For anyway.
frontDoor.use((request, _response, next) => {
  request.headers["x-forwarded-for"] = trustProxy === false ? request.socket.remoteAddress : request.ip;
  next();
});
// The fastest level: pages stream in many small chunks, each flushed through zlib as it comes, where a
// higher level costs far more time than it saves bytes.
frontDoor.use(compression({ filter: worthCompressing, level: zlibConstants.Z_BEST_SPEED }));
// Every answer carries the security headers: pages, the API, static and public files, and React Router's
// own refusals alike. An answer that sets one of them itself keeps its own.
frontDoor.use((_request, response, next) => {
  const nonce = newCspNonce();
  response.locals.cspNonce = nonce;
  onHeaders(response, () => applySecurityHeaders({ has: (name) => response.hasHeader(name), set: (name, value) => response.setHeader(name, value) }, nonce));
  next();
});
// An oversized body or a foreign Host is answered before anything reads the body.
frontDoor.use((request, response, next) => {
  if (!refuseBeforeReading(request, response)) next();
});

// The build itself, not a function returning it: React Router derives its route tree and request handler
// again on every request from a build function. Development still sees edits, since Vite loads this
// module afresh after a route changes (server.js asks for it per request).
export const requestHandler = createRequestHandler({
  build,
  getLoadContext(_request, response) {
    const context = new RouterContextProvider();
    context.set(cspNonceContext, response.locals.cspNonce);
    return context;
  },
});
