import { defineConfig } from "vitest/config";

// Kept apart from vite.config.ts: the React Router plugin must not run under vitest.
export default defineConfig({
  resolve: { alias: { "~": new URL("./app", import.meta.url).pathname } },
  test: {
    include: ["app/**/*.test.ts", "tests/**/*.test.ts"],
    testTimeout: 30_000,
    hookTimeout: 180_000,
  },
});
