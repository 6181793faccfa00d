/**
 * The yardstick for the stack figures: the smallest React Router app that
 * does what ours does at its front (a root with the document, one page, one
 * resource route), built from this project's own node_modules into a
 * temporary folder and served by express through @react-router/express.
 * Same framework version, same React, same express: what our server costs
 * beyond it is what our own layers add.
 */
import { spawn, spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";

const files: Record<string, string> = {
  "package.json": JSON.stringify({
    name: "minimal-react-router-app",
    private: true,
    type: "module",
    // The framework picks its default server entry from the dependencies.
    dependencies: Object.fromEntries(["@react-router/express", "@react-router/node", "express", "isbot", "react", "react-dom", "react-router"].map((name) => [name, "*"])),
  }),
  "react-router.config.ts": `export default { ssr: true, future: { v8_middleware: true } };`,
  "vite.config.ts": `import { reactRouter } from "@react-router/dev/vite";\nimport { defineConfig } from "vite";\nexport default defineConfig({ plugins: [reactRouter()] });`,

  "app/root.tsx": `import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head><meta charSet="utf-8" /><meta name="viewport" content="width=device-width, initial-scale=1" /><Meta /><Links /></head>
      <body>{children}<ScrollRestoration /><Scripts /></body>
    </html>
  );
}
export default function App() { return <Outlet />; }
`,
  "app/routes/page.tsx": `export const meta = () => [{ title: "Page" }];
export function loader() { return null; }
export default function Page() {
  return (<form method="post"><h1>Sign in</h1><label>E-mail <input name="email" type="email" required /></label><label>Password <input name="password" type="password" required /></label><button type="submit">Sign in</button></form>);
}
`,
  "app/routes/healthz.ts": `export function loader() { return Response.json({ status: "ok" }); }\n`,
  "app/routes/filler.tsx": `export function loader() { return null; }\nexport default function Filler() { return <p>Filler</p>; }\n`,
  "server.mjs": `import express from "express";
import { createRequestHandler } from "@react-router/express";
const build = await import("./build/server/index.js");
const app = express();
app.disable("x-powered-by");
app.use("/assets", express.static("build/client/assets", { immutable: true, maxAge: "1y" }));
app.use(createRequestHandler({ build }));
const server = app.listen(0, "127.0.0.1", () => console.log(server.address().port));
`,
};

/**
 * The routes: the page, the resource route and `fillerRoutes` more pages that
 * no request asks for. React Router's server matches every request against
 * the whole route table and rebuilds the server routes for every page it
 * renders, so its own cost grows with the table; the fillers give the
 * yardstick as many routes as ours, for scale.
 */
function routesFile(fillerRoutes: number) {
  const fillers = Array.from({ length: fillerRoutes }, (_, i) => `route("filler-${i}/:id", "routes/filler.tsx", { id: "filler-${i}" })`);
  return `import { route } from "@react-router/dev/routes";\nexport default [${[...fillers, `route("page", "routes/page.tsx")`, `route("healthz", "routes/healthz.ts")`].join(", ")}];`;
}

/** Writes and builds the minimal app (with `fillerRoutes` unused routes besides its two); returns its folder. */
export function buildMinimalApp(fillerRoutes = 0) {
  const folder = mkdtempSync(join(tmpdir(), "minimal-react-router-"));
  for (const [name, text] of Object.entries({ ...files, "app/routes.ts": routesFile(fillerRoutes) })) {
    mkdirSync(join(folder, name, ".."), { recursive: true });
    writeFileSync(join(folder, name), text);
  }
  symlinkSync(resolve("node_modules"), join(folder, "node_modules"), "dir");
  const build = spawnSync(join(folder, "node_modules/.bin/react-router"), ["build"], { cwd: folder, encoding: "utf8" });
  if (build.status !== 0) throw new Error(`minimal app build failed:\n${build.stderr}`);
  return folder;
}

/** Starts the built minimal app in a process of its own; resolves with its base URL and a stop function. */
export async function startMinimalApp(folder: string) {
  const child = spawn(process.execPath, ["server.mjs"], { cwd: folder, env: { ...process.env, NODE_ENV: "production" }, stdio: ["ignore", "pipe", "inherit"] });
  const port = await new Promise<string>((done) => child.stdout!.once("data", (chunk: Buffer) => done(chunk.toString().trim())));
  return {
    url: `http://127.0.0.1:${port}`,
    pid: child.pid!,
    stop: () => new Promise<void>((done) => (child.exitCode !== null ? done() : (child.once("exit", () => done()), child.kill()))),
  };
}
