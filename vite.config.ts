import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig(({ isSsrBuild }) => ({
  // The server build includes the server's own request handling (server/app.ts), which server.js
  // imports in production; in development server.js loads the same module through Vite.
  build: isSsrBuild ? { rolldownOptions: { input: "./server/app.ts" } } : {},
  plugins: [tailwindcss(), reactRouter()],
  resolve: { alias: { "~": new URL("./app", import.meta.url).pathname } },
}));
