import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig(({ isSsrBuild }) => ({
  // The production server's build includes its request handling (server/app.ts), served by server.js.
  build: isSsrBuild ? { rolldownOptions: { input: "./server/app.ts" } } : {},
  plugins: [tailwindcss(), reactRouter()],
  resolve: { alias: { "~": new URL("./app", import.meta.url).pathname } },
}));
