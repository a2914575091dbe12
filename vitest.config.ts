import path from "node:path";
import { defineConfig } from "vitest/config";

const root = path.dirname(new URL(import.meta.url).pathname);

const resolve = {
  alias: {
    "@": root,
    // Query modules are marked server-only for Next; under vitest they run on the server anyway.
    "server-only": path.join(root, "tests/support/server-only.ts"),
  },
};

export default defineConfig({
  resolve,
  test: {
    projects: [
      {
        resolve,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        resolve,
        // Client components with their API stood in for by msw.
        test: { name: "components", include: ["tests/components/**/*.test.tsx"], environment: "jsdom" },
      },
      {
        resolve,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          testTimeout: 30_000,
          // The files share one database and check whole tables; run them one after another.
          fileParallelism: false,
          hookTimeout: 60_000,
          setupFiles: ["tests/support/integration-setup.ts"],
        },
      },
      {
        resolve,
        // Journeys through the running product in Debian's Chromium; `npm test` starts
        // the stack and gives its address (scripts/test.ts).
        test: {
          name: "browser",
          include: ["tests/browser/**/*.test.ts"],
          environment: "node",
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
