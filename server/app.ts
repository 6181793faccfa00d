/**
 * The production server's request handling, built by Vite with the app (so it
 * shares the app's modules and their caches): repeat API precision reads
 * answered from memory, then the client's address, static files and React
 * Router through express.
 */
import type { IncomingMessage, ServerResponse } from "node:http";
import { fileURLToPath } from "node:url";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import morgan from "morgan";
import onHeaders from "on-headers";
import { answerRepeatPrecisionRead } from "~/server/api-repeat-reads.server";
import { assertDeploymentConfig, refuseBeforeReading } from "~/server/deployment.server";
import { applySecurityHeaders } from "~/server/security-headers.server";

assertDeploymentConfig();

const clientFiles = fileURLToPath(new URL("../client", import.meta.url));
const logRequest = morgan("tiny");

/** Express's "trust proxy" from TRUST_PROXY: unset trusts no proxy, a number counts hops, anything else names addresses or subnets. */
function trustedProxies(value = process.env.TRUST_PROXY) {
  if (!value || value === "false") return false;
  if (value === "true") return true;
  return /^\d+$/.test(value) ? Number(value) : value;
}

const app = express();
app.disable("x-powered-by");
app.set("trust proxy", trustedProxies());
// The rate limits key on X-Forwarded-For: replace whatever the client sent with the address express trusts.
app.use((request, _response, next) => {
  request.headers["x-forwarded-for"] = request.ip;
  next();
});
app.use(compression());
// Every answer carries the security headers, also static files and React Router's own refusals,
// which the root middleware never sees; an answer that sets one keeps its own.
app.use((_request, response, next) => {
  onHeaders(response, () => applySecurityHeaders({ has: (name) => response.hasHeader(name), set: (name, value) => void response.setHeader(name, value) }));
  next();
});
app.use("/assets", express.static(`${clientFiles}/assets`, { immutable: true, maxAge: "1y" }));
app.use(express.static(clientFiles, { maxAge: "1h" }));
app.use(createRequestHandler({ build: () => import("virtual:react-router/server-build") }));

export async function handleRequest(request: IncomingMessage, response: ServerResponse) {
  logRequest(request, response, () => undefined);
  if (refuseBeforeReading(request, response)) return;
  try {
    const answer = await answerRepeatPrecisionRead(request.method, request.url, request.headers);
    if (answer) {
      response.writeHead(answer.status, answer.headers);
      response.end(answer.body);
      return;
    }
  } catch (error) {
    // The full route answers instead, and reports the error in its own shape.
    console.error(error);
  }
  app(request, response);
}
