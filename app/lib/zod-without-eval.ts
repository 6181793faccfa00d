/**
 * Zod compiles fast object parsers with `new Function` where a page allows it,
 * and probes for that by trying. The Content-Security-Policy allows no eval,
 * so the probe would be refused and reported as a violation on every page with
 * a form. Imported first by root.tsx, so it runs before any schema is made.
 */
import { z } from "zod";

z.config({ jitless: true });
