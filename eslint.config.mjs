import { defineConfig, globalIgnores } from "eslint/config";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

export default defineConfig([
  ...nextVitals,
  ...nextTs,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    // The pure domain code (value lists, rules, the decision, schedules, heat loss,
    // schemas, the MQTT contract) runs in the browser, the web app, the controller and
    // the tests alike: it imports nothing from the layers above it, nothing that only
    // runs on a server, and no Node built-ins.
    files: ["lib/**/*.{ts,tsx,mts,js,mjs}"],
    ignores: ["lib/server/**", "lib/client/**", "lib/stack/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              regex: "^(@/|(\\.\\./)+)(db|app|controller|components|fakes|scripts)(/|$)",
              message: "Pure domain code in lib/ may not import the database, pages, controller, components or runners.",
            },
            {
              regex: "^(@/lib/|\\./|(\\.\\./)+)(server|client|stack)(/|$)",
              message: "Pure domain code may not import lib/server, lib/client or lib/stack glue.",
            },
            { regex: "^node:", message: "Pure domain code may not import Node built-ins: keep it runnable in the browser." },
          ],
          paths: [
            { name: "server-only", message: "Pure domain code may not be server-only." },
            { name: "next/headers", message: "Pure domain code may not read requests." },
            { name: "mqtt", message: "Pure domain code may not open connections (lib/server/wake.ts does)." },
            { name: "mysql2", message: "Pure domain code may not reach the database." },
            { name: "drizzle-orm", message: "Pure domain code may not reach the database." },
          ],
        },
      ],
    },
  },
  globalIgnores([".next/**", ".data/**", "test-results/**", "node_modules/**", "drizzle/**", "next-env.d.ts", "coverage/**"]),
]);
