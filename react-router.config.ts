import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // BUILD_DIR lets two builds (say, a benchmark and a test run) live side by side.
  buildDirectory: process.env.BUILD_DIR ?? "build",
  future: {
    // Root middleware sets the security headers on every response, resource routes included.
    v8_middleware: true,
  },
} satisfies Config;
