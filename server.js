// Production entry: `node server.js` serves the build in BUILD_DIR (default build/) on PORT (default 3000).
import { createServer } from "node:http";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";

const buildDirectory = resolve(process.env.BUILD_DIR ?? "build");
const { handleRequest } = await import(pathToFileURL(`${buildDirectory}/server/index.js`).href);
const port = Number(process.env.PORT ?? 3000);

const server = createServer(handleRequest);
server.listen(port, process.env.HOST, () => console.log(`Ringbatch serving ${buildDirectory} on http://localhost:${port}`));
for (const signal of ["SIGTERM", "SIGINT"]) {
  process.once(signal, () => server.close(() => process.exit(0)).closeAllConnections());
}
