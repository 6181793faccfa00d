/**
 * `node server.js` serves the build in BUILD_DIR (default build/) on PORT
 * (default 3000). With NODE_ENV=development (`npm run dev`) it runs Vite in
 * middleware mode instead (default port 5173) and loads the same server module
 * (server/app.ts) through it, so headers, limits and the request path are the
 * same in development as in production.
 */
import { readdirSync } from "node:fs";
import { createServer } from "node:http";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import express from "express";
import morgan from "morgan";

const development = process.env.NODE_ENV === "development";
const port = Number(process.env.PORT ?? (development ? 5173 : 3000));
const app = express();
app.disable("x-powered-by");
// A line per request costs a write to stdout on every answer; in production a proxy in front usually
// keeps the access log, so outside development the app writes one only when REQUEST_LOG is set.
if (development || process.env.REQUEST_LOG) app.use(morgan("tiny"));

let vite;
let startNoticeSchedule;
if (!development) {
  const buildDirectory = resolve(process.env.BUILD_DIR ?? "build");
  const { frontDoor, requestHandler, startNoticeSchedule: start } = await import(pathToFileURL(`${buildDirectory}/server/index.js`).href);
  startNoticeSchedule = start;
  app.use(frontDoor);
  app.use("/assets", express.static(`${buildDirectory}/client/assets`, { immutable: true, maxAge: "1y" }));
  // The public files (icons, manifest) are known when the server starts; asking the file system about
  // every other path, as express.static would, costs a stat per page and API request.
  const publicFiles = new Set(readdirSync(`${buildDirectory}/client`).map((name) => `/${name}`));
  const servePublic = express.static(`${buildDirectory}/client`, { maxAge: "1h" });
  app.use((request, response, next) => (publicFiles.has(request.path) ? servePublic(request, response, next) : next()));
  app.use(requestHandler);
} else {
  vite = await (await import("vite")).createServer({ server: { middlewareMode: true } });
  // Loaded per request: Vite hands back the module it has, or a fresh one after an edit.
  const serverModule = () => vite.ssrLoadModule("./server/app.ts");
  startNoticeSchedule = async () => (await serverModule()).startNoticeSchedule();
  app.use((request, response, next) => serverModule().then((module) => module.frontDoor(request, response, next), next));
  app.use(vite.middlewares);
  app.use((request, response, next) =>
    serverModule()
      .then((module) => module.requestHandler(request, response, next))
      .catch((error) => {
        if (error instanceof Error) vite.ssrFixStacktrace(error);
        next(error);
      }),
  );
}

const server = createServer(app);
server.listen(port, process.env.HOST, () => {
  console.log(`Ringbatch (${development ? "development" : process.env.NODE_ENV === "production" ? "production" : "local"}) on http://localhost:${port}`);
  // Scheduled notices (NOTICE_SCHEDULE, every 5 minutes unless "off"): safe to run in every instance.
  startNoticeSchedule();
});
for (const signal of ["SIGTERM", "SIGINT"]) {
  process.once(signal, async () => {
    await vite?.close();
    server.close(() => process.exit(0)).closeAllConnections();
  });
}
