import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  future: {
    // Root middleware sets the security headers on every response, resource routes included.
    v8_middleware: true,
  },
} satisfies Config;
