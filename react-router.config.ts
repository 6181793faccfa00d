import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // BUILD_DIR lets two builds (say, a benchmark and a test run) live side by side.
  buildDirectory: process.env.BUILD_DIR ?? "build",
  future: {
    // Route middleware: the study parents check access once; the root refuses cross-site posts.
    v8_middleware: true,
  },
} satisfies Config;
