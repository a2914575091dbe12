import { defineConfig } from "drizzle-kit";

// Only `drizzle-kit generate` is used: migrations are applied by db/migrate.ts.
// (push/pull misread MariaDB's JSON check constraints.)
export default defineConfig({
  dialect: "mysql",
  schema: "./db/schema/index.ts",
  out: "./drizzle",
  casing: "snake_case",
});
