"use client";

import { z } from "zod";

// zod compiles object parsers with `new Function` when it may, and finds out by trying
// one: under the content security policy (no 'unsafe-eval', lib/security-headers.ts)
// that try is a reported violation. Tell it not to, before any form or fetch parses.
z.config({ jitless: true });

/** Rendered once by the root layout so its setting runs in every page's browser bundle. */
export function ZodWithoutEval() {
  return null;
}
